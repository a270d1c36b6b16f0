// Trials of the saved draft on a reference set: start one, follow its progress, read its figures,
// tune a limit on the sweep, open misjudged photos in the preview, and submit the draft for review.
import { useEffect, useState } from 'react';
import { StyleSheet, View } from 'react-native';
import type { RuleVersion } from '../../shared/api/rules';
import type { Station } from '../../shared/api/stations';
import type { Trial } from '../../shared/api/trials';
import { stationTitle, formatDateTime } from '../../lib/format';
import { colors, radius, space } from '../../lib/theme';
import { useReferenceSets } from '../../hooks/useReferenceSets';
import { isTrialRunning, useLimitSweep, useStartTrial, useTrial, useTrialsOfVersion } from '../../hooks/useTrials';
import { AppText } from '../AppText';
import { Button } from '../Button';
import { ChoiceChips } from '../ChoiceChips';
import { ErrorBanner } from '../ErrorBanner';
import { ErrorState, LoadingState } from '../StateViews';
import type { EditorGauge } from '../rules/ruleEditorState';
import { LimitSweepPlot } from './LimitSweepPlot';
import { SubmitDialog } from './SubmitDialog';
import { TrialFigures } from './TrialFigures';
import { MisjudgedPhotos, SlowestPhotos } from './TrialImages';
import { describeSetCounts } from '../references/setCounts';
import { trialCautions } from '../../shared/rules/trial-cautions';

interface TrialPanelProps {
  version: RuleVersion;
  partType: string;
  /** The plant's stations: a calibrated one gives gauges in mm their scale (shared with the preview). */
  stations: Station[];
  stationId: string | null;
  onStation: (id: string | null) => void;
  /** The editor holds changes the saved version does not have yet. */
  unsaved: boolean;
  gauges: EditorGauge[];
  onPickLimit: (gaugeName: string, bound: 'min' | 'max', value: number) => void;
  onOpenInPreview: (setId: string, imageId: string) => void;
  onSubmitted: () => void;
}

function newestFirst(trials: Trial[]): Trial[] {
  return [...trials].sort((a, b) => b.createdAt.localeCompare(a.createdAt));
}

function ProgressBar({ done, total, label }: { done: number; total: number; label: string }) {
  const fraction = total > 0 ? done / total : 0;
  return (
    <View style={styles.progressWrap}>
      <View role="progressbar" aria-label={label} aria-valuemin={0} aria-valuemax={total} aria-valuenow={done} style={styles.progressTrack}>
        <View style={[styles.progressFill, { width: `${fraction * 100}%` }]} />
      </View>
      <AppText variant="caption" role="status" aria-live="polite">{`${label}: ${done} of ${total} photos`}</AppText>
    </View>
  );
}

export function TrialPanel({ version, partType, stations, stationId, onStation, unsaved, gauges, onPickLimit, onOpenInPreview, onSubmitted }: TrialPanelProps) {
  const sets = useReferenceSets();
  const trials = useTrialsOfVersion(version.id);
  const start = useStartTrial();
  const [setId, setSetId] = useState<string | null>(null);
  const [trialId, setTrialId] = useState<string | null>(null);
  const [sweepGauge, setSweepGauge] = useState<string | null>(null);
  const [submitting, setSubmitting] = useState(false);

  const latest = trials.data ? newestFirst(trials.data)[0] : undefined;
  useEffect(() => {
    if (trialId === null && latest) setTrialId(latest.id);
  }, [latest, trialId]);
  const trial = useTrial(trialId);
  const running = isTrialRunning(trial.data);

  const offered = (sets.data ?? []).filter((s) => s.partType === partType);
  const chosenSet = setId ?? trial.data?.referenceSetId ?? offered[0]?.id ?? null;
  const unlabelledInSet = offered.find((s) => s.id === chosenSet)?.counts.unlabelled ?? 0;
  const tunable = gauges.filter((g) => g.gauge.limits.max !== undefined || g.gauge.limits.min !== undefined);
  const gaugeName = sweepGauge && tunable.some((g) => g.gauge.name === sweepGauge) ? sweepGauge : tunable[0]?.gauge.name ?? null;
  const tunedGauge = tunable.find((g) => g.gauge.name === gaugeName);
  const bound: 'min' | 'max' = tunedGauge && tunedGauge.gauge.limits.max === undefined ? 'min' : 'max';
  const done = trial.data?.state === 'done' ? trial.data : undefined;
  const sweep = useLimitSweep(done?.id ?? null, gaugeName, bound);
  const needsMm = gauges.some((g) => g.gauge.unit === 'mm' || g.gauge.unit === 'mm2');
  const calibrated = stations.filter((st) => st.active && st.mmPerPx);
  const station = stations.find((st) => st.id === stationId) ?? null;

  const foreseenRefusal = unsaved
    ? 'The editor has changes that are not saved; the saved version is what goes to review.'
    : !done
      ? 'This draft has no finished trial yet.'
      : done.contentHash !== version.contentHash
        ? 'The draft changed after its latest trial: run the trial again first.'
        : null;

  const run = () => {
    if (!chosenSet) return;
    start.mutate(
      { ruleVersionId: version.id, referenceSetId: chosenSet, stationId: stationId ?? undefined },
      { onSuccess: (started) => setTrialId(started.id) },
    );
  };

  if (sets.isError) return <ErrorState error={sets.error} onRetry={() => void sets.refetch()} />;
  if (!sets.data || trials.isPending) return <LoadingState label="Loading trials…" />;

  return (
    <View style={styles.panel}>
      {offered.length === 0 ? (
        <AppText tone="muted">No reference set of this part type yet. Create one under Reference sets and label its photos, then run a trial here.</AppText>
      ) : (
        <ChoiceChips label="Reference set for the trial" choices={offered.map((s) => ({ value: s.id, label: `${s.name} (${describeSetCounts(s.counts)})` }))} value={chosenSet ?? ''} onChange={setSetId} />
      )}
      {unlabelledInSet > 0 ? (
        <AppText variant="caption" tone="muted">{`${unlabelledInSet} unlabelled photo${unlabelledInSet === 1 ? ' is' : 's are'} left out of the trial: a trial compares verdicts with labels. Label them on the set’s page.`}</AppText>
      ) : null}
      {needsMm ? (
        <ChoiceChips<string | null>
          label="Station whose calibration turns px into mm"
          choices={calibrated.map((st) => ({ value: st.id, label: stationTitle(st) }))}
          value={stationId}
          onChange={onStation}
        />
      ) : null}
      <AppText variant="caption" tone="muted">
        {station?.mmPerPx ? `Gauges in mm use ${station.mmPerPx.toPrecision(3)} mm/px, the calibration of ${stationTitle(station)} (the preview uses it too).` : needsMm ? 'A gauge is in mm: choose a calibrated station above.' : 'Every gauge is in pixels: no station is needed.'}
      </AppText>
      <View style={styles.actions}>
        <Button
          label={running ? 'Trial running…' : 'Run trial'}
          onPress={run}
          busy={start.isPending}
          disabled={running || unsaved || !chosenSet || (needsMm && !station?.mmPerPx)}
          accessibilityHint="Runs the saved draft on every photo of the reference set, in the background"
        />
        <Button label="Submit for review" variant="secondary" onPress={() => setSubmitting(true)} disabled={running} />
      </View>
      {unsaved ? <AppText tone="caution">⚠ Save the draft first: a trial runs the saved version.</AppText> : null}
      {start.error ? <ErrorBanner error={start.error} /> : null}

      {trial.isError ? (
        <ErrorState error={trial.error} onRetry={() => void trial.refetch()} />
      ) : !trial.data ? (
        trialId ? <LoadingState label="Loading the trial…" /> : <AppText tone="muted">No trial of this version yet. Run one to see its false reject and escape rates.</AppText>
      ) : (
        <View style={styles.panel}>
          <AppText variant="bodyStrong">
            {`Trial on ${trial.data.referenceSetName}${trial.data.mmPerPx ? ` at ${trial.data.mmPerPx.toPrecision(3)} mm/px` : ''} · ${formatDateTime(trial.data.createdAt)}`}
          </AppText>
          {trial.data.contentHash !== version.contentHash ? (
            <AppText tone="caution">⚠ This trial ran on an earlier content of the draft; run it again to see the current figures.</AppText>
          ) : null}
          {running ? <ProgressBar done={trial.data.processed} total={trial.data.total} label={trial.data.state === 'queued' ? 'Waiting to start' : 'Running'} /> : null}
          {trial.data.state === 'failed' ? <AppText tone="danger">{`⚠ The trial failed: ${trial.data.error ?? 'no reason given'}. Correct the rule or the set and run it again.`}</AppText> : null}
          {done?.summary ? (
            <>
              <TrialFigures summary={done.summary} />
              <AppText variant="heading">Limit tuning</AppText>
              {tunable.length === 0 ? (
                <AppText tone="muted">Add a gauge with a limit to sweep it.</AppText>
              ) : (
                <>
                  <ChoiceChips label="Gauge to sweep" choices={tunable.map((g) => ({ value: g.gauge.name, label: g.gauge.name }))} value={gaugeName ?? ''} onChange={setSweepGauge} />
                  {sweep.isError ? (
                    <ErrorState error={sweep.error} onRetry={() => void sweep.refetch()} />
                  ) : !sweep.data ? (
                    <LoadingState label="Sweeping the limit…" />
                  ) : (
                    <LimitSweepPlot sweep={sweep.data} draftLimit={tunedGauge?.gauge.limits[bound]} onPick={(limit) => gaugeName && onPickLimit(gaugeName, bound, limit)} />
                  )}
                </>
              )}
              <AppText variant="heading">Misjudged photos</AppText>
              <MisjudgedPhotos trialId={done.id} onOpen={(imageId) => onOpenInPreview(done.referenceSetId, imageId)} />
              <AppText variant="heading">Slowest photos</AppText>
              <SlowestPhotos trialId={done.id} />
            </>
          ) : null}
        </View>
      )}
      {submitting ? (
        <SubmitDialog
          versionId={version.id}
          versionNumber={version.number}
          foreseenRefusal={foreseenRefusal}
          cautions={done?.summary ? trialCautions(done.summary) : []}
          onClose={() => setSubmitting(false)}
          onSubmitted={() => {
            setSubmitting(false);
            onSubmitted();
          }}
        />
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  panel: { gap: space.md },
  actions: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  progressWrap: { gap: space.xs },
  progressTrack: { height: 12, borderRadius: radius.pill, backgroundColor: colors.surfaceSunken, borderWidth: 1, borderColor: colors.control, overflow: 'hidden' },
  progressFill: { height: '100%', backgroundColor: colors.steel },
});
