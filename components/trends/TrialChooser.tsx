import { StyleSheet, View } from 'react-native';
import { formatDate } from '../../lib/format';
import { useRule } from '../../hooks/useRules';
import { useTrialsOfVersion } from '../../hooks/useTrials';
import { space } from '../../lib/theme';
import { AppText } from '../AppText';
import { ChoiceChips } from '../ChoiceChips';
import { ErrorState, LoadingState } from '../StateViews';

interface TrialChooserProps {
  ruleId: string;
  versionId: string | null;
  onVersion: (id: string | null) => void;
  trialId: string | null;
  onTrial: (id: string | null) => void;
}

function FinishedTrials({ versionId, trialId, onTrial }: { versionId: string; trialId: string | null; onTrial: (id: string | null) => void }) {
  const trials = useTrialsOfVersion(versionId);
  if (trials.isPending) return <LoadingState label="Loading the version’s trials…" />;
  if (trials.isError) return <ErrorState error={trials.error} onRetry={() => trials.refetch()} />;
  const done = trials.data.filter((t) => t.state === 'done');
  if (done.length === 0) return <AppText tone="muted">This version has no finished trial. An engineer runs trials on a reference set from the rule’s page.</AppText>;
  return (
    <ChoiceChips<string | null>
      label="Finished trial"
      value={trialId}
      onChange={onTrial}
      choices={done.map((t) => ({ value: t.id, label: `${t.referenceSetName} · ${formatDate(t.finishedAt ?? t.createdAt)}` }))}
    />
  );
}

/** A rule's version, then one of its finished trials: the trial's verdicts are compared with the reference set's labels. */
export function TrialChooser({ ruleId, versionId, onVersion, trialId, onTrial }: TrialChooserProps) {
  const rule = useRule(ruleId);
  if (rule.isPending) return <LoadingState label="Loading the rule’s versions…" />;
  if (rule.isError) return <ErrorState error={rule.error} onRetry={() => rule.refetch()} />;
  return (
    <View style={styles.column}>
      <ChoiceChips<string | null>
        label="Rule version"
        value={versionId}
        onChange={(id) => {
          onVersion(id);
          onTrial(null);
        }}
        choices={[...rule.data.versions].sort((a, b) => b.number - a.number).map((v) => ({ value: v.id, label: `v${v.number} (${v.state})` }))}
      />
      {versionId ? <FinishedTrials versionId={versionId} trialId={trialId} onTrial={onTrial} /> : null}
    </View>
  );
}

const styles = StyleSheet.create({
  column: { gap: space.md },
});
