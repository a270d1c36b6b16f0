import { useState } from 'react';
import { Image, StyleSheet, View } from 'react-native';
import { DISPUTES_PER_PAGE, useDisputes, useResolveDispute, type DisputeState } from '../../hooks/useDisputes';
import { useSession } from '../../hooks/useSession';
import { formatDate } from '../../lib/format';
import { radius, space } from '../../lib/theme';
import type { DisputeItem } from '../../shared/api/inspections';
import { AppText } from '../AppText';
import { Button } from '../Button';
import { Card } from '../Card';
import { ChoiceChips } from '../ChoiceChips';
import { Pagination } from '../Pagination';
import { EmptyState, ErrorState, LoadingState } from '../StateViews';
import { MeasurementList } from '../inspect/MeasurementList';
import { VERDICT_LOOK } from '../inspect/VerdictMark';
import { NoteDialog } from './NoteDialog';

type Judgement = 'good' | 'defective';

/** Verdicts operators disputed: a qualified person judges the part itself and says how. */
export function DisputeQueue() {
  const { user } = useSession();
  const mayResolve = user?.roles.includes('supervisor') ?? false;
  const [state, setState] = useState<DisputeState>('open');
  const [offset, setOffset] = useState(0);
  const [resolving, setResolving] = useState<{ item: DisputeItem; judgement: Judgement } | null>(null);
  const disputes = useDisputes(state, offset);
  const resolve = useResolveDispute();

  return (
    <View style={styles.section}>
      <ChoiceChips<DisputeState>
        label="Show"
        choices={[
          { value: 'open', label: 'Waiting for a judgement' },
          { value: 'resolved', label: 'Judged' },
        ]}
        value={state}
        onChange={(next) => {
          setState(next);
          setOffset(0);
        }}
      />
      {disputes.isPending ? (
        <LoadingState label="Loading disputed verdicts…" />
      ) : disputes.error ? (
        <ErrorState error={disputes.error} onRetry={() => void disputes.refetch()} />
      ) : disputes.data.items.length === 0 ? (
        <EmptyState
          title={state === 'open' ? 'No disputed verdicts waiting' : 'No disputes judged yet'}
          body={state === 'open' ? 'When an operator disputes a verdict, the part and its record appear here for a qualified person to judge.' : 'Judged disputes are kept here with the judgement and its note.'}
        />
      ) : (
        <>
          {disputes.data.items.map((item) => {
            const i = item.inspection;
            const look = VERDICT_LOOK[i.verdict];
            return (
              <Card key={item.id} style={styles.item}>
                <View style={styles.head}>
                  <AppText variant="heading">{`${look.symbol} ${i.verdict} · ${i.ruleName} v${i.ruleVersionNumber}`}</AppText>
                  <AppText tone="muted">{`${i.stationName} · ${i.operator.name} · ${formatDate(i.createdAt)} ${new Date(i.createdAt).toLocaleTimeString()}`}</AppText>
                </View>
                <View style={styles.body}>
                  <Image source={{ uri: i.evidenceUrl ?? i.imageUrl }} style={styles.photo} resizeMode="contain" accessibilityLabel={`Photo of the disputed part from ${i.stationName}`} />
                  <View style={styles.details}>
                    <AppText>{`Operator’s note: “${i.dispute?.note ?? ''}”`}</AppText>
                    <MeasurementList measurements={i.measurements} />
                  </View>
                </View>
                {i.dispute?.resolvedAt ? (
                  <AppText variant="bodyStrong">{`Judged ${i.dispute.judgement === 'good' ? '✓ good' : '✕ defective'} on ${formatDate(i.dispute.resolvedAt)}: “${i.dispute.resolutionNote ?? ''}”`}</AppText>
                ) : mayResolve ? (
                  <View style={styles.actions}>
                    <Button label="Part is good" variant="secondary" onPress={() => setResolving({ item, judgement: 'good' })} accessibilityLabel={`Judge the part of ${i.operator.name}'s dispute good`} />
                    <Button label="Part is defective" variant="secondary" onPress={() => setResolving({ item, judgement: 'defective' })} accessibilityLabel={`Judge the part of ${i.operator.name}'s dispute defective`} />
                  </View>
                ) : null}
              </Card>
            );
          })}
          <Pagination offset={offset} limit={DISPUTES_PER_PAGE} shown={disputes.data.items.length} total={disputes.data.total} noun="disputes" onChange={setOffset} />
        </>
      )}
      <NoteDialog
        visible={resolving !== null}
        title={resolving?.judgement === 'good' ? 'Judge the part good' : 'Judge the part defective'}
        message="Your judgement of the part itself is recorded beside the verdict, which stays as it was given. Say how you judged the part (gauge, drawing, procedure)."
        fieldLabel="How the part was judged"
        requiredMessage="Say how the part was judged"
        confirmLabel="Record judgement"
        busy={resolve.isPending}
        error={resolve.error}
        onCancel={() => {
          setResolving(null);
          resolve.reset();
        }}
        onConfirm={(note) => resolving && resolve.mutate({ id: resolving.item.id, judgement: resolving.judgement, note }, { onSuccess: () => setResolving(null) })}
      />
    </View>
  );
}

const styles = StyleSheet.create({
  section: { gap: space.md },
  item: { gap: space.md },
  head: { gap: space.xxs },
  body: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
  photo: { width: 240, maxWidth: '100%', aspectRatio: 4 / 3, borderRadius: radius.md },
  details: { flexGrow: 1, flexShrink: 1, flexBasis: 260, gap: space.sm },
  actions: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
});
