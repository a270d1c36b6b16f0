// Photos of a trial: those the rule misjudged (each opens in the preview) and the slowest ones.
import { Image, StyleSheet, View } from 'react-native';
import type { TrialResult } from '../../shared/api/trials';
import { colors, radius, space } from '../../lib/theme';
import { useLabelWords } from '../../hooks/useReferenceSets';
import { useTrialResults } from '../../hooks/useTrials';
import { AppText } from '../AppText';
import { Button } from '../Button';
import { ErrorState, LoadingState } from '../StateViews';

function ResultRow({ result, detail, onOpen }: { result: TrialResult; detail: string; onOpen?: () => void }) {
  return (
    <View style={styles.row}>
      {result.thumbnailUrl ? <Image source={{ uri: result.thumbnailUrl }} style={styles.thumb} accessibilityLabel={`Thumbnail of ${result.fileName}`} /> : null}
      <View style={styles.text}>
        <AppText variant="label" numberOfLines={1}>{result.fileName}</AppText>
        <AppText variant="caption">{detail}</AppText>
      </View>
      {onOpen ? <Button label="Open in preview" compact variant="secondary" accessibilityLabel={`Open ${result.fileName} in the preview`} onPress={onOpen} /> : null}
    </View>
  );
}

export function MisjudgedPhotos({ trialId, onOpen }: { trialId: string; onOpen: (imageId: string) => void }) {
  const results = useTrialResults(trialId, { outcome: 'misjudged', sort: 'file', limit: 50, offset: 0 });
  const labelWord = useLabelWords();
  if (results.isError) return <ErrorState error={results.error} onRetry={() => void results.refetch()} />;
  if (!results.data) return <LoadingState label="Loading misjudged photos…" />;
  if (results.data.items.length === 0) return <AppText tone="notice">✓ The rule agreed with every labelled photo.</AppText>;
  return (
    <View style={styles.list}>
      <AppText variant="caption" tone="muted">{`${results.data.total} misjudged${results.data.total > results.data.items.length ? `, first ${results.data.items.length} shown` : ''}`}</AppText>
      {results.data.items.map((r) => (
        <ResultRow
          key={r.imageId}
          result={r}
          detail={`Labelled ${labelWord(r)}, judged ${r.verdict} · ${r.measurements.filter((m) => !m.pass).map((m) => `${m.name} outside its limits`).join(', ') || 'every gauge within limits'}`}
          onOpen={() => onOpen(r.imageId)}
        />
      ))}
    </View>
  );
}

export function SlowestPhotos({ trialId }: { trialId: string }) {
  const results = useTrialResults(trialId, { outcome: 'all', sort: 'slowest', limit: 5, offset: 0 });
  if (results.isError) return <ErrorState error={results.error} onRetry={() => void results.refetch()} />;
  if (!results.data) return <LoadingState label="Loading the slowest photos…" />;
  return (
    <View style={styles.list}>
      {results.data.items.map((r) => (
        <ResultRow key={r.imageId} result={r} detail={`${r.durationMs.toFixed(0)} ms · judged ${r.verdict}`} />
      ))}
    </View>
  );
}

const styles = StyleSheet.create({
  list: { gap: space.xs },
  row: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: space.sm, paddingVertical: space.xs, borderBottomWidth: 1, borderBottomColor: colors.line },
  thumb: { width: 64, height: 48, borderRadius: radius.sm, backgroundColor: colors.surfaceSunken },
  text: { flexGrow: 1, flexShrink: 1, flexBasis: 180 },
});
