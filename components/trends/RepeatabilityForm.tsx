import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import * as ImagePicker from 'expo-image-picker';
import { useLines } from '../../hooks/useStations';
import { useCreateRepeatabilityStudy, useReleasedRules } from '../../hooks/useStudies';
import { ApiError, type UploadablePhoto } from '../../lib/api';
import { colors, radius, space } from '../../lib/theme';
import { createRepeatabilityStudySchema, type RepeatabilityStudy } from '../../shared/api/studies';
import { AppText } from '../AppText';
import { Button } from '../Button';
import { ChoiceChips } from '../ChoiceChips';
import { ErrorBanner } from '../ErrorBanner';
import { ErrorState, LoadingState } from '../StateViews';
import { TextField } from '../TextField';
import { StationChoice } from './StationChoice';

const MIN_PHOTOS = 2;
const MAX_PHOTOS = 50;

type KnownLabel = RepeatabilityStudy['knownLabel'];

interface RepeatabilityFormProps {
  onDone: (study: RepeatabilityStudy) => void;
}

function ProgressBar({ fraction, label }: { fraction: number; label: string }) {
  const pct = Math.round(fraction * 100);
  return (
    <View role="progressbar" aria-label={label} aria-valuemin={0} aria-valuemax={100} aria-valuenow={pct} style={styles.track}>
      <View style={[styles.fill, { width: `${pct}%` }]} />
    </View>
  );
}

/** A new repeatability study: the released rule version and station, the part, its known state, and 2 to 50 photos of it. */
export function RepeatabilityForm({ onDone }: RepeatabilityFormProps) {
  const rules = useReleasedRules();
  const lines = useLines();
  const create = useCreateRepeatabilityStudy();
  const [ruleVersionId, setRuleVersionId] = useState<string | null>(null);
  const [stationId, setStationId] = useState<string | null>(null);
  const [partLabel, setPartLabel] = useState('');
  const [knownLabel, setKnownLabel] = useState<KnownLabel>('unknown');
  const [photos, setPhotos] = useState<UploadablePhoto[]>([]);
  const [progress, setProgress] = useState(0);
  const [problems, setProblems] = useState<Record<string, string>>({});

  if (rules.isPending || lines.isPending) return <LoadingState label="Loading released rules and stations…" />;
  if (rules.isError) return <ErrorState error={rules.error} onRetry={() => rules.refetch()} />;
  if (lines.isError) return <ErrorState error={lines.error} onRetry={() => lines.refetch()} />;
  if (rules.data.length === 0) {
    return <AppText tone="muted">No rule has a released version yet. A repeatability study runs the version the line uses; release one in Review first.</AppText>;
  }

  const pickPhotos = async () => {
    const result = await ImagePicker.launchImageLibraryAsync({ mediaTypes: ['images'], allowsMultipleSelection: true, selectionLimit: MAX_PHOTOS, quality: 1 });
    if (result.canceled) return;
    const picked: UploadablePhoto[] = result.assets.map((asset, i) => {
      const name = asset.fileName ?? `photo-${i + 1}.jpg`;
      return asset.file ? { name, blob: asset.file as Blob } : { name, uri: asset.uri, type: asset.mimeType ?? 'image/jpeg' };
    });
    setPhotos(picked);
    setProblems((p) => ({ ...p, photos: '' }));
  };

  const submit = () => {
    const found: Record<string, string> = {};
    const parsed = createRepeatabilityStudySchema.safeParse({ ruleVersionId: ruleVersionId ?? undefined, stationId: stationId ?? undefined, partLabel, knownLabel });
    if (!parsed.success) for (const issue of parsed.error.issues) found[String(issue.path[0])] ??= issue.message;
    if (found.ruleVersionId) found.ruleVersionId = 'Choose the released rule to study.';
    if (found.stationId) found.stationId = 'Choose the station the photos were taken at.';
    if (photos.length < MIN_PHOTOS || photos.length > MAX_PHOTOS) found.photos = `Choose ${MIN_PHOTOS} to ${MAX_PHOTOS} photos of the same part (now ${photos.length}).`;
    setProblems(found);
    if (!parsed.success || found.photos) return;
    setProgress(0);
    create.mutate(
      { fields: parsed.data, photos, onProgress: setProgress },
      {
        onSuccess: (study) => {
          setPhotos([]);
          setPartLabel('');
          onDone(study);
        },
      },
    );
  };

  const serverIssues = create.error instanceof ApiError ? Object.fromEntries(create.error.fieldIssues.map((i) => [i.path, i.message])) : {};
  const problem = (key: string) => problems[key] || serverIssues[key] || undefined;
  const activeLines = lines.data.map((l) => ({ ...l, stations: l.stations.filter((s) => s.active) }));

  return (
    <View style={styles.form}>
      <AppText tone="muted">
        Photograph one part again and again at a station, taking it away and putting it back each time, as an operator would. Does the rule give the same verdict, and how much do its gauges vary?
      </AppText>
      <ChoiceChips<string | null>
        label="Released rule"
        value={ruleVersionId}
        onChange={setRuleVersionId}
        choices={rules.data.map((r) => ({ value: r.releasedVersion!.id, label: `${r.name} v${r.releasedVersion!.number}` }))}
      />
      {problem('ruleVersionId') ? <AppText variant="caption" tone="danger" accessibilityRole="alert">{`⚠ ${problem('ruleVersionId')}`}</AppText> : null}
      <StationChoice lines={activeLines} value={stationId} onChange={setStationId} error={problem('stationId')} />
      <TextField label="Part (serial number or tag)" value={partLabel} onChangeText={setPartLabel} placeholder="Bracket S/N 20417" error={problem('partLabel')} maxLength={120} />
      <ChoiceChips<KnownLabel>
        label="What the part is known to be"
        value={knownLabel}
        onChange={setKnownLabel}
        choices={[
          { value: 'good', label: 'Good' },
          { value: 'defective', label: 'Defective' },
          { value: 'unknown', label: 'Not judged' },
        ]}
      />
      <View style={styles.photoRow}>
        <Button label={photos.length > 0 ? 'Choose other photos' : 'Choose photos'} variant="secondary" onPress={() => void pickPhotos()} accessibilityHint={`Choose ${MIN_PHOTOS} to ${MAX_PHOTOS} photos of the same part at once`} />
        <AppText tone={photos.length > 0 ? 'default' : 'muted'} style={styles.grow}>
          {photos.length === 0 ? `No photos chosen (${MIN_PHOTOS} to ${MAX_PHOTOS}).` : `${photos.length} photo${photos.length === 1 ? '' : 's'} chosen: ${photos.slice(0, 3).map((p) => p.name).join(', ')}${photos.length > 3 ? '…' : ''}`}
        </AppText>
      </View>
      {problem('photos') ? <AppText variant="caption" tone="danger" accessibilityRole="alert">{`⚠ ${problem('photos')}`}</AppText> : null}
      {create.isPending ? (
        <View style={styles.progress}>
          <AppText variant="label" role="status" aria-live="polite">
            {progress < 1 ? `Sending ${photos.length} photos: ${Math.round(progress * 100)} %` : `Judging ${photos.length} photos with the rule…`}
          </AppText>
          <ProgressBar fraction={progress} label="Photos sent" />
        </View>
      ) : null}
      {create.isError && Object.keys(serverIssues).length === 0 ? <ErrorBanner error={create.error} /> : null}
      <Button label="Run the study" onPress={submit} busy={create.isPending} style={styles.start} />
    </View>
  );
}

const styles = StyleSheet.create({
  form: { gap: space.md },
  photoRow: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: space.md },
  grow: { flexGrow: 1, flexShrink: 1, flexBasis: 200 },
  progress: { gap: space.xs },
  track: { height: 8, borderRadius: radius.pill, backgroundColor: colors.surfaceSunken, borderWidth: 1, borderColor: colors.control, overflow: 'hidden' },
  fill: { height: '100%', backgroundColor: colors.steel },
  start: { alignSelf: 'flex-start' },
});
