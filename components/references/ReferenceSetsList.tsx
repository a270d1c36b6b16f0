// Every reference set with its label counts; create a new one.
import { useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import { Link, useRouter } from 'expo-router';
import type { ReferenceSet } from '../../shared/api/references';
import { findArea } from '../../lib/navigation';
import { formatDate } from '../../lib/format';
import { colors, minTouchTarget, radius, space } from '../../lib/theme';
import { usePartTypeName, useReferenceSets } from '../../hooks/useReferenceSets';
import { AppText } from '../AppText';
import { Button } from '../Button';
import { Screen } from '../Screen';
import { EmptyState, ErrorState, LoadingState } from '../StateViews';
import { CreateSetDialog } from './CreateSetDialog';

function SetRow({ set, partTypeName }: { set: ReferenceSet; partTypeName: string }) {
  const { counts } = set;
  return (
    <Link href={`/reference-sets/${set.id}`} asChild>
      <Pressable accessibilityRole="link" accessibilityLabel={`Open reference set ${set.name}`} style={styles.row}>
        <View style={styles.main}>
          <AppText variant="bodyStrong" tone="steel">{`${set.name} ›`}</AppText>
          <AppText variant="caption" tone="muted">{`${partTypeName} · created ${formatDate(set.createdAt)}`}</AppText>
        </View>
        <AppText variant="label">{`${counts.total} photos · ✓ ${counts.good} good · ✕ ${counts.defective} defective · ↻ ${counts.retake} retake · ? ${counts.unlabelled} unlabelled`}</AppText>
      </Pressable>
    </Link>
  );
}

export function ReferenceSetsList() {
  const router = useRouter();
  const sets = useReferenceSets();
  const [creating, setCreating] = useState(false);
  const nameOf = usePartTypeName();
  return (
    <Screen title={findArea('reference-sets').title} subtitle={findArea('reference-sets').purpose} actions={<Button label="New reference set" onPress={() => setCreating(true)} />}>
      {sets.isError && !sets.data ? (
        <ErrorState error={sets.error} onRetry={() => void sets.refetch()} />
      ) : !sets.data ? (
        <LoadingState label="Loading reference sets…" />
      ) : sets.data.length === 0 ? (
        <EmptyState title="No reference sets yet" body="Create a set for a part type, then add photos of known good and known defective parts and label them." action={<Button label="New reference set" onPress={() => setCreating(true)} />} />
      ) : (
        <View style={styles.list}>
          {sets.data.map((set) => (
            <SetRow key={set.id} set={set} partTypeName={nameOf(set.partType)} />
          ))}
        </View>
      )}
      {creating ? <CreateSetDialog onClose={() => setCreating(false)} onCreated={(set) => { setCreating(false); router.push(`/reference-sets/${set.id}`); }} /> : null}
    </Screen>
  );
}

const styles = StyleSheet.create({
  list: { gap: space.sm },
  row: { gap: space.xs, minHeight: minTouchTarget, padding: space.md, borderRadius: radius.lg, borderWidth: 1, borderColor: colors.line, backgroundColor: colors.surface },
  main: { gap: space.xxs },
});
