import { useState } from 'react';
import { formatDate } from '../../lib/format';
import { Pressable, StyleSheet, View } from 'react-native';
import { useRepeatabilityStudies } from '../../hooks/useStudies';
import { colors, minTouchTarget, radius, space } from '../../lib/theme';
import type { RepeatabilityStudy } from '../../shared/api/studies';
import { AppText } from '../AppText';
import { Button } from '../Button';
import { Card } from '../Card';
import { ErrorState, LoadingState } from '../StateViews';
import { RepeatabilityForm } from './RepeatabilityForm';
import { RepeatabilityResult } from './RepeatabilityResult';

/** Repeatability: run a new study, or read one run before. */
export function RepeatabilityPanel({ canRun }: { canRun: boolean }) {
  const studies = useRepeatabilityStudies();
  const [chosen, setChosen] = useState<RepeatabilityStudy | null>(null);
  const [running, setRunning] = useState(false);

  return (
    <Card style={styles.card}>
      <View style={styles.header}>
        <AppText variant="heading" style={styles.grow}>
          Repeatability
        </AppText>
        {canRun && !running ? <Button label="New study" variant="secondary" compact onPress={() => setRunning(true)} /> : null}
      </View>
      {running ? (
        <>
          <RepeatabilityForm
            onDone={(study) => {
              setRunning(false);
              setChosen(study);
            }}
          />
          <Button label="Cancel the new study" variant="quiet" compact onPress={() => setRunning(false)} style={styles.start} />
        </>
      ) : null}
      {chosen ? (
        <View style={styles.chosen}>
          <View style={styles.header}>
            <AppText variant="heading" headingLevel={3} style={styles.grow}>{`Study of “${chosen.partLabel}”`}</AppText>
            <Button label="Close" variant="quiet" compact accessibilityLabel="Close the study" onPress={() => setChosen(null)} />
          </View>
          <RepeatabilityResult study={chosen} />
        </View>
      ) : null}
      <AppText variant="label">Studies run before</AppText>
      {studies.isPending ? (
        <LoadingState label="Loading studies…" />
      ) : studies.isError ? (
        <ErrorState error={studies.error} onRetry={() => studies.refetch()} />
      ) : studies.data.length === 0 ? (
        <AppText tone="muted">{canRun ? 'None yet. Start one with “New study”: choose a released rule, a station, and 2 to 50 photos of one part.' : 'None yet.'}</AppText>
      ) : (
        <View role="list" style={styles.list}>
          {studies.data.map((study) => (
            <Pressable
              key={study.id}
              role="listitem"
              accessibilityRole="button"
              accessibilityLabel={`Study of ${study.partLabel}, ${study.ruleName} at ${study.stationName}: ${study.consistent ? 'consistent' : 'not consistent'}. Show it.`}
              onPress={() => setChosen(study)}
              style={({ pressed }) => [styles.row, pressed && styles.pressed, chosen?.id === study.id && styles.selected]}
            >
              <AppText variant="bodyStrong" tone={study.consistent ? 'notice' : 'danger'}>
                {study.consistent ? '✓' : '✕'}
              </AppText>
              <View style={styles.grow}>
                <AppText variant="bodyStrong">{`${study.partLabel} · ${study.ruleName} v${study.ruleVersionNumber}`}</AppText>
                <AppText variant="caption" tone="muted">{`${study.stationName} · ${study.photos} photos · ${study.verdicts.PASS} PASS, ${study.verdicts.FAIL} FAIL, ${study.verdicts.RETAKE} RETAKE · ${formatDate(study.createdAt)}`}</AppText>
              </View>
            </Pressable>
          ))}
        </View>
      )}
    </Card>
  );
}

const styles = StyleSheet.create({
  card: { gap: space.md },
  header: { flexDirection: 'row', alignItems: 'center', gap: space.md, flexWrap: 'wrap' },
  grow: { flex: 1 },
  start: { alignSelf: 'flex-start' },
  chosen: { gap: space.sm, padding: space.md, borderRadius: radius.md, borderWidth: 1, borderColor: colors.control },
  list: { gap: space.xs },
  row: { flexDirection: 'row', alignItems: 'center', gap: space.md, minHeight: minTouchTarget, paddingVertical: space.sm, paddingHorizontal: space.sm, borderRadius: radius.md, borderBottomWidth: 1, borderBottomColor: colors.line },
  pressed: { backgroundColor: colors.steelTint },
  selected: { backgroundColor: colors.steelTint },
});
