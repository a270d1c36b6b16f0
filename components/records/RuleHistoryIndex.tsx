// The records area's way into rule history: every rule, each opening its versions, signatures, trials and changes.
import { Link, useRouter } from 'expo-router';
import { useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import { useDebouncedValue } from '../../hooks/useDebouncedValue';
import { usePartTypeName } from '../../hooks/useReferenceSets';
import { useRuleList } from '../../hooks/useRules';
import { colors, minTouchTarget, radius, space } from '../../lib/theme';
import type { RuleSummary } from '../../shared/api/rules';
import { AppText } from '../AppText';
import { Button } from '../Button';
import { Card } from '../Card';
import { Pagination } from '../Pagination';
import { VersionState } from '../rules/VersionState';
import { Screen } from '../Screen';
import { EmptyState, ErrorState, LoadingState } from '../StateViews';
import { TextField } from '../TextField';

const PAGE_SIZE = 20;

function RuleLine({ rule }: { rule: RuleSummary }) {
  const partTypeName = usePartTypeName();
  return (
    <Link href={`/rules/${rule.id}/history`} asChild>
      <Pressable accessibilityRole="link" accessibilityLabel={`History of the rule ${rule.name}`} style={styles.row}>
        <View style={styles.main}>
          <AppText variant="bodyStrong" tone="steel">{`${rule.name} ›`}</AppText>
          <AppText variant="caption" tone="muted">{`${rule.latestVersion.number} version${rule.latestVersion.number === 1 ? '' : 's'} · ${partTypeName(rule.partType)} · created by ${rule.createdBy.name}`}</AppText>
        </View>
        <View style={styles.states}>
          {[rule.releasedVersion, rule.releasedVersion?.id === rule.latestVersion.id ? null : rule.latestVersion].map((v) =>
            v ? (
              <View key={v.id} style={styles.state}>
                <VersionState state={v.state} number={v.number} sentBack={v.sentBack} />
              </View>
            ) : null,
          )}
        </View>
      </Pressable>
    </Link>
  );
}

export function RuleHistoryIndex() {
  const router = useRouter();
  const [search, setSearch] = useState('');
  const [offset, setOffset] = useState(0);
  const debounced = useDebouncedValue(search, 300);
  const list = useRuleList({ search: debounced, state: null, partType: null, mine: false, limit: PAGE_SIZE, offset });
  const items = list.data?.items ?? [];
  return (
    <Screen
      title="Rule history"
      subtitle="Every rule’s versions: who changed, reviewed, signed and released each one, when and why, its trials and what changed."
      actions={<Button label="Inspection records" variant="secondary" onPress={() => router.push('/records')} />}
    >
      <TextField label="Search rules" placeholder="Name" value={search} onChangeText={(text) => { setSearch(text); setOffset(0); }} autoCorrect={false} />
      {list.isPending ? (
        <LoadingState label="Loading rules…" />
      ) : list.isError ? (
        <ErrorState error={list.error} onRetry={() => void list.refetch()} />
      ) : items.length === 0 ? (
        <EmptyState
          title={search ? 'No rule matches' : 'No rules yet'}
          body={search ? 'Check the spelling or clear the search.' : 'Rules appear here once an engineer creates one; their history starts with that first draft.'}
        />
      ) : (
        <Card style={styles.list}>
          {items.map((rule) => (
            <RuleLine key={rule.id} rule={rule} />
          ))}
          <Pagination offset={offset} limit={PAGE_SIZE} shown={items.length} total={list.data?.total ?? 0} noun="rules" onChange={setOffset} />
        </Card>
      )}
    </Screen>
  );
}

const styles = StyleSheet.create({
  list: { gap: space.xs },
  row: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: space.md, minHeight: minTouchTarget, paddingVertical: space.sm, paddingHorizontal: space.sm, borderRadius: radius.md, borderBottomWidth: 1, borderBottomColor: colors.line },
  main: { flex: 1, minWidth: 200, gap: space.xxs },
  states: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  state: { flexDirection: 'row', alignItems: 'center', gap: space.xs },
});
