// One rule: its versions and their states; an engineer edits the open draft or starts a new one.
import { StyleSheet, View } from 'react-native';
import { useRouter } from 'expo-router';
import { isSentBack } from '../../shared/api/rules';
import { formatDate } from '../../lib/format';
import { requestLeave } from '../../lib/leaveGuard';
import { space } from '../../lib/theme';
import { usePartTypeName } from '../../hooks/useReferenceSets';
import { useRule, useStartNewDraft } from '../../hooks/useRules';
import { useSession } from '../../hooks/useSession';
import { AppText } from '../AppText';
import { Button } from '../Button';
import { Card } from '../Card';
import { ErrorBanner } from '../ErrorBanner';
import { Screen } from '../Screen';
import { ErrorState, LoadingState } from '../StateViews';
import { DraftEditor } from './DraftEditor';
import { VersionState } from './VersionState';
import { VersionSummary } from './VersionSummary';
import { TrialFigures } from '../review/TrialFigures';

export function RulePage({ id }: { id: string }) {
  const router = useRouter();
  const { user } = useSession();
  const rule = useRule(id);
  const partTypeNameOf = usePartTypeName();
  const newDraft = useStartNewDraft();
  const isEngineer = user?.roles.includes('engineer') ?? false;

  if (rule.isError) {
    return (
      <Screen title="Rule">
        <ErrorState error={rule.error} onRetry={() => void rule.refetch()} />
        <Button label="Back to rules" variant="secondary" onPress={() => router.replace('/rules')} />
      </Screen>
    );
  }
  if (!rule.data) {
    return (
      <Screen title="Rule">
        <LoadingState label="Loading the rule…" />
      </Screen>
    );
  }
  const data = rule.data;
  const versions = [...data.versions].sort((a, b) => b.number - a.number);
  const latest = versions[0];
  const draft = latest?.state === 'draft' ? latest : null;
  const base = data.versions.find((v) => v.id === data.releasedVersion?.id) ?? latest;
  const partTypeName = partTypeNameOf(data.partType);

  return (
    <Screen
      title={data.name}
      subtitle={`${partTypeName}${data.smallestDefectMm !== null ? ` · smallest defect to catch ${data.smallestDefectMm} mm` : ''} · created by ${data.createdBy.name}`}
      actions={
        <>
          <Button label="History" variant="secondary" accessibilityLabel={`History of ${data.name}: versions, signatures, trials and changes`} onPress={() => requestLeave(() => router.push(`/rules/${data.id}/history`))} />
          <Button label="All rules" variant="secondary" onPress={() => requestLeave(() => router.push('/rules'))} />
        </>
      }
    >
      <Card>
        <AppText variant="heading">Versions</AppText>
        {versions.map((v) => (
          <View key={v.id} style={styles.version}>
            <VersionState state={v.state} number={v.number} sentBack={isSentBack(v)} />
            <AppText variant="caption" tone="muted" style={styles.grow}>
              {`by ${v.author.name}, edited ${formatDate(v.editedAt)}${v.releasedAt ? ` · released ${formatDate(v.releasedAt)}${v.reviewer ? ` by ${v.reviewer.name}` : ''}` : ''}${v.reviewNote ? ` · review note: “${v.reviewNote}”` : ''}${v.withdrawReason ? ` · withdrawn: “${v.withdrawReason}”` : ''}`}
            </AppText>
          </View>
        ))}
        {isEngineer && latest?.state === 'in-review' ? (
          <AppText style={styles.newDraft}>{`Version ${latest.number} is in review. A rule has one open draft or review at a time: the next draft can start once a supervisor releases it or sends it back.`}</AppText>
        ) : null}
        {isEngineer && !draft && latest && latest.state !== 'in-review' ? (
          <View style={styles.newDraft}>
            <AppText>Released and withdrawn versions stay as they are; changes go into a new draft.</AppText>
            <Button
              label={`New draft from version ${base.number}`}
              onPress={() => newDraft.mutate({ ruleId: data.id, fromVersionId: base.id })}
              busy={newDraft.isPending}
              style={styles.start}
            />
            {newDraft.error ? <ErrorBanner error={newDraft.error} /> : null}
          </View>
        ) : null}
      </Card>
      {draft && isEngineer ? (
        <DraftEditor key={draft.id} rule={data} version={draft} canEdit={isEngineer} onSubmitted={() => void rule.refetch()} />
      ) : latest ? (
        <Card>
          <AppText variant="heading">{`Version ${latest.number}`}</AppText>
          <VersionSummary document={latest.document} />
          {latest.submittedTrialId ? (
            <View style={styles.trial}>
              <AppText variant="bodyStrong">{`The trial submitted with version ${latest.number}`}</AppText>
              <TrialFigures trialId={latest.submittedTrialId} />
            </View>
          ) : null}
        </Card>
      ) : null}
    </Screen>
  );
}

const styles = StyleSheet.create({
  version: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: space.sm },
  grow: { flexGrow: 1, flexShrink: 1, flexBasis: 200 },
  newDraft: { gap: space.sm, marginTop: space.sm },
  start: { alignSelf: 'flex-start' },
  trial: { gap: space.sm, marginTop: space.md },
});
