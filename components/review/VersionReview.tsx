import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { useRouter } from 'expo-router';
import { useRuleDetail, useRuleVersion, useSendBackVersion, useWithdrawVersion } from '../../hooks/useReview';
import { useSession } from '../../hooks/useSession';
import { formatDate } from '../../lib/format';
import { isSentBack } from '../../shared/api/rules';
import { diffRuleDocuments } from '../../shared/rules/diff';
import { space } from '../../lib/theme';
import { AppText } from '../AppText';
import { Button } from '../Button';
import { Card } from '../Card';
import { Screen } from '../Screen';
import { ErrorState, LoadingState } from '../StateViews';
import { SafetyNote } from '../inspect/SafetyNote';
import { NoteDialog } from './NoteDialog';
import { ReleaseDialog } from './ReleaseDialog';
import { RuleDiffTable } from './RuleDiffTable';
import { SignatureList } from './SignatureList';
import { TrialFigures } from './TrialFigures';
import { VersionState } from '../rules/VersionState';

type Decision = 'release' | 'send-back' | 'withdraw' | null;

/** One rule version as a reviewer needs it: what changed, the evidence, the author's note, the signatures, the decision. */
export function VersionReview({ versionId }: { versionId: string }) {
  const router = useRouter();
  const { user } = useSession();
  const version = useRuleVersion(versionId);
  const rule = useRuleDetail(version.data?.ruleId);
  const sendBack = useSendBackVersion();
  const withdraw = useWithdrawVersion();
  const [decision, setDecision] = useState<Decision>(null);

  if (version.isPending) return <Screen title="Review"><LoadingState label="Loading the rule version…" /></Screen>;
  if (version.error) return <Screen title="Review"><ErrorState error={version.error} onRetry={() => void version.refetch()} /></Screen>;
  const v = version.data;
  // The version it would replace: the released one, or for a released version the one it superseded.
  const compared = rule.data?.versions.find((other) => other.id !== v.id && (other.state === 'released' || (v.state !== 'in-review' && other.state === 'superseded' && other.number < v.number)));
  const isSupervisor = user?.roles.includes('supervisor') ?? false;
  const isAuthor = user?.id === v.author.id;

  return (
    <Screen
      title={`${v.ruleName} · v${v.number}`}
      subtitle={`Written by ${v.author.name}${v.submittedAt ? `, submitted ${formatDate(v.submittedAt)}` : ''}`}
      actions={<Button label="Back to the review list" variant="quiet" compact onPress={() => router.push('/review')} />}
    >
      <VersionState state={v.state} sentBack={isSentBack(v)} />
      {v.state === 'withdrawn' && v.withdrawReason ? <AppText>{`Withdrawn: “${v.withdrawReason}”`}</AppText> : null}

      <Card>
        <AppText variant="heading">Author’s note</AppText>
        <AppText>{v.authorNote ? `“${v.authorNote}”` : 'The author left no note.'}</AppText>
        {v.reviewNote ? <AppText tone="muted">{`Reviewer’s note: “${v.reviewNote}”${v.reviewer ? ` (${v.reviewer.name})` : ''}`}</AppText> : null}
      </Card>

      <Card>
        <AppText variant="heading">{compared || rule.isPending ? 'What changed' : 'What the version holds'}</AppText>
        {rule.isPending ? (
          <LoadingState label="Loading the released version…" />
        ) : rule.error ? (
          <ErrorState error={rule.error} onRetry={() => void rule.refetch()} />
        ) : (
          <RuleDiffTable
            rows={diffRuleDocuments(compared?.document ?? null, v.document)}
            beforeTitle={compared ? `v${compared.number} (${compared.state})` : null}
            afterTitle={`v${v.number} (this version)`}
          />
        )}
      </Card>

      <Card>
        <AppText variant="heading">Trial on the reference set</AppText>
        <TrialFigures trialId={v.submittedTrialId} />
      </Card>

      <Card>
        <AppText variant="heading">Signatures</AppText>
        <SignatureList signatures={v.signatures} />
      </Card>

      <SafetyNote />

      {isSupervisor && v.state === 'in-review' ? (
        isAuthor ? (
          <AppText tone="caution">⚠ You wrote this version, so another supervisor must release or send it back.</AppText>
        ) : (
          <View style={styles.actions}>
            <Button label="Send back" variant="secondary" onPress={() => setDecision('send-back')} accessibilityLabel={`Send ${v.ruleName} v${v.number} back to the engineer`} />
            <Button label="Release" onPress={() => setDecision('release')} accessibilityLabel={`Release ${v.ruleName} v${v.number}`} />
          </View>
        )
      ) : null}
      {isSupervisor && v.state === 'released' ? (
        <View style={styles.actions}>
          <Button label="Withdraw" variant="danger" onPress={() => setDecision('withdraw')} accessibilityLabel={`Withdraw ${v.ruleName} v${v.number} from the line`} />
        </View>
      ) : null}

      <ReleaseDialog version={v} visible={decision === 'release'} onClose={() => setDecision(null)} onReleased={() => setDecision(null)} />
      <NoteDialog
        visible={decision === 'send-back'}
        title={`Send ${v.ruleName} v${v.number} back`}
        message="The version goes back to the engineer as a draft with your note. Nothing reaches the line."
        fieldLabel="What must change"
        requiredMessage="Say what must change"
        confirmLabel="Send back"
        busy={sendBack.isPending}
        error={sendBack.error}
        onCancel={() => setDecision(null)}
        onConfirm={(note) => sendBack.mutate({ id: v.id, note }, { onSuccess: () => setDecision(null) })}
      />
      <NoteDialog
        visible={decision === 'withdraw'}
        title={`Withdraw ${v.ruleName} v${v.number}`}
        message="Operators can no longer inspect with this version from now on. Earlier inspections keep it as their record. This cannot be undone."
        fieldLabel="Reason for withdrawal"
        requiredMessage="Give the reason"
        confirmLabel="Withdraw"
        destructive
        busy={withdraw.isPending}
        error={withdraw.error}
        onCancel={() => setDecision(null)}
        onConfirm={(reason) => withdraw.mutate({ id: v.id, reason }, { onSuccess: () => setDecision(null) })}
      />
    </Screen>
  );
}

const styles = StyleSheet.create({
  actions: { flexDirection: 'row', flexWrap: 'wrap', justifyContent: 'flex-end', gap: space.sm },
});
