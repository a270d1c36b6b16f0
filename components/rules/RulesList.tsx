// Every rule with its latest and released versions and newest trial: search, filter by owner, state and part type, create one.
import { useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import { Link, useRouter } from 'expo-router';
import { RULE_VERSION_STATES, type RuleSummary, type RuleVersionState } from '../../shared/api/rules';
import { findArea } from '../../lib/navigation';
import { formatDate, formatPercent } from '../../lib/format';
import { colors, minTouchTarget, radius, space } from '../../lib/theme';
import { useDebouncedValue } from '../../hooks/useDebouncedValue';
import { useLayout } from '../../hooks/useLayout';
import { usePartTypeName, usePartTypes } from '../../hooks/useReferenceSets';
import { useRuleList } from '../../hooks/useRules';
import { useSession } from '../../hooks/useSession';
import { AppText } from '../AppText';
import { Button } from '../Button';
import { ChoiceChips } from '../ChoiceChips';
import { FilterPanel } from '../FilterPanel';
import { Pagination } from '../Pagination';
import { Screen } from '../Screen';
import { EmptyState, ErrorState, LoadingState } from '../StateViews';
import { TextField } from '../TextField';
import { CreateRuleDialog } from './CreateRuleDialog';
import { describeRuleFilters } from './ruleFilterSummary';
import { STATE_WORDS, VersionState } from './VersionState';

const PAGE_SIZE = 20;

function describeLastTrial(trial: NonNullable<RuleSummary['lastTrial']>): string {
  const of = `Last trial (version ${trial.versionNumber}, ${formatDate(trial.createdAt)})`;
  if (trial.state === 'queued' || trial.state === 'running') return `${of}: still running`;
  if (trial.state === 'failed') return `${of}: failed, see the rule`;
  return `${of}: ${formatPercent(trial.agreement)} agree with labels · false rejects ${formatPercent(trial.falseRejectRate)} · escapes ${formatPercent(trial.escapeRate)}`;
}

function RuleRow({ rule, partTypeName }: { rule: RuleSummary; partTypeName: string }) {
  return (
    <Link href={`/rules/${rule.id}`} asChild>
      <Pressable accessibilityRole="link" accessibilityLabel={`Open rule ${rule.name}`} style={styles.row}>
        <View style={styles.rowMain}>
          <AppText variant="bodyStrong" tone="steel">{`${rule.name} ›`}</AppText>
          <AppText variant="caption" tone="muted">{`${partTypeName}${rule.smallestDefectMm !== null ? ` · smallest defect ${rule.smallestDefectMm} mm` : ''} · by ${rule.createdBy.name}, ${formatDate(rule.createdAt)}`}</AppText>
          <AppText variant="caption">{rule.lastTrial ? describeLastTrial(rule.lastTrial) : 'No trial yet'}</AppText>
        </View>
        <View style={styles.states}>
          <VersionState state={rule.latestVersion.state} number={rule.latestVersion.number} sentBack={rule.latestVersion.sentBack} />
          {rule.releasedVersion && rule.releasedVersion.id !== rule.latestVersion.id ? <VersionState state={rule.releasedVersion.state} number={rule.releasedVersion.number} /> : null}
        </View>
      </Pressable>
    </Link>
  );
}

export function RulesList() {
  const { user } = useSession();
  const router = useRouter();
  const phone = useLayout() === 'phone';
  const partTypes = usePartTypes();
  const [search, setSearch] = useState('');
  const [state, setState] = useState<RuleVersionState | null>(null);
  const [partType, setPartType] = useState<string | null>(null);
  const [mine, setMine] = useState(false);
  const [offset, setOffset] = useState(0);
  const [creating, setCreating] = useState(false);
  const debounced = useDebouncedValue(search, 300);
  const list = useRuleList({ search: debounced, state, partType, mine, limit: PAGE_SIZE, offset });
  const isEngineer = user?.roles.includes('engineer') ?? false;
  const filtered = search !== '' || state !== null || partType !== null || mine;
  const nameOf = usePartTypeName();

  return (
    <Screen
      title={findArea('rules').title}
      subtitle="Inspection rules: a pipeline of image steps, then gauges with limits; versioned from draft to released."
      actions={isEngineer ? <Button label="New rule" onPress={() => setCreating(true)} /> : undefined}
    >
      <TextField label="Search rules" placeholder="Name" value={search} onChangeText={(t) => { setSearch(t); setOffset(0); }} autoCorrect={false} />
      <FilterPanel summary={describeRuleFilters({ mine, state, partType }, (s) => STATE_WORDS[s].word, nameOf)} foldable={phone}>
        <ChoiceChips
          label="Owner"
          choices={[{ value: false, label: 'Everyone’s rules' }, { value: true, label: 'Rules I created or edited' }]}
          value={mine}
          onChange={(v) => { setMine(v); setOffset(0); }}
        />
        <ChoiceChips
          label="State of the latest version"
          choices={[{ value: null, label: 'Any' }, ...RULE_VERSION_STATES.map((s) => ({ value: s, label: STATE_WORDS[s].word }))]}
          value={state}
          onChange={(v) => { setState(v); setOffset(0); }}
        />
        {partTypes.data ? (
          <ChoiceChips label="Part type" choices={[{ value: null, label: 'Any' }, ...partTypes.data.map((p) => ({ value: p.code, label: p.name }))]} value={partType} onChange={(v) => { setPartType(v); setOffset(0); }} />
        ) : null}
      </FilterPanel>
      {list.isError && !list.data ? (
        <ErrorState error={list.error} onRetry={() => void list.refetch()} />
      ) : !list.data ? (
        <LoadingState label="Loading rules…" />
      ) : list.data.items.length === 0 ? (
        <EmptyState
          title={filtered ? 'No rules match' : 'No rules yet'}
          body={filtered ? 'No rule matches this search and these filters.' : isEngineer ? 'Create the first rule: it starts from a simple edge-finding pipeline you can change.' : 'Engineers create rules; they appear here once they exist.'}
          action={filtered ? <Button label="Clear search and filters" variant="secondary" onPress={() => { setSearch(''); setState(null); setPartType(null); setMine(false); }} /> : isEngineer ? <Button label="New rule" onPress={() => setCreating(true)} /> : undefined}
        />
      ) : (
        <View style={[styles.results, list.isPlaceholderData && styles.stale]}>
          {list.data.items.map((rule) => (
            <RuleRow key={rule.id} rule={rule} partTypeName={nameOf(rule.partType)} />
          ))}
          <Pagination offset={offset} limit={PAGE_SIZE} shown={list.data.items.length} total={list.data.total} noun="rules" onChange={setOffset} />
        </View>
      )}
      {creating ? <CreateRuleDialog onClose={() => setCreating(false)} onCreated={(rule) => { setCreating(false); router.push(`/rules/${rule.id}`); }} /> : null}
    </Screen>
  );
}

const styles = StyleSheet.create({
  results: { gap: space.sm },
  stale: { opacity: 0.6 },
  row: {
    flexDirection: 'row',
    flexWrap: 'wrap',
    alignItems: 'center',
    gap: space.md,
    minHeight: minTouchTarget,
    padding: space.md,
    borderRadius: radius.lg,
    borderWidth: 1,
    borderColor: colors.line,
    backgroundColor: colors.surface,
  },
  rowMain: { flexGrow: 1, flexShrink: 1, flexBasis: 240, gap: space.xxs },
  states: { flexDirection: 'row', flexWrap: 'wrap', gap: space.xs },
});
