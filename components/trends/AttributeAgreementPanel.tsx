import { useState } from 'react';
import { ActivityIndicator, StyleSheet, View } from 'react-native';
import { useAttributeAgreement } from '../../hooks/useStudies';
import { colors, space } from '../../lib/theme';
import type { AttributeAgreementQuery } from '../../shared/api/studies';
import type { TrendChoices } from '../../shared/api/trends';
import { AppText } from '../AppText';
import { Card } from '../Card';
import { ChoiceChips } from '../ChoiceChips';
import { ErrorState, LoadingState } from '../StateViews';
import { TextField } from '../TextField';
import { AgreementFigures } from './AgreementFigures';
import { TrialChooser } from './TrialChooser';
import { rangeFor, rangeProblem, type RangeChoice, type RangePreset } from './trendRange';

type Source = AttributeAgreementQuery['source'];

function queryFor(source: Source, ruleId: string | null, range: RangeChoice, trialId: string | null): AttributeAgreementQuery | null {
  if (source === 'trial') return trialId ? { source, trialId } : null;
  const span = rangeFor(range, Date.now());
  return ruleId && span ? { source, ruleId, ...span } : null;
}

/** The rule's verdicts against a qualified person's judgement: resolved disputes on the line, or a trial on a labelled set. */
export function AttributeAgreementPanel({ choices }: { choices: TrendChoices }) {
  const [source, setSource] = useState<Source>('disputes');
  const [ruleId, setRuleId] = useState<string | null>(null);
  const [range, setRange] = useState<RangeChoice>({ preset: '90d', customFrom: '', customTo: '' });
  const [versionId, setVersionId] = useState<string | null>(null);
  const [trialId, setTrialId] = useState<string | null>(null);
  const query = queryFor(source, ruleId, range, trialId);
  const result = useAttributeAgreement(query);

  return (
    <Card style={styles.card}>
      <AppText variant="heading">Attribute agreement</AppText>
      <AppText tone="muted">Does the rule call parts good or defective as a qualified person does?</AppText>
      <ChoiceChips<Source>
        label="Compare with"
        value={source}
        onChange={setSource}
        choices={[
          { value: 'disputes', label: 'Resolved disputes on the line' },
          { value: 'trial', label: 'A finished trial on a labelled set' },
        ]}
      />
      <ChoiceChips<string | null>
        label="Rule"
        value={ruleId}
        onChange={(id) => {
          setRuleId(id);
          setVersionId(null);
          setTrialId(null);
        }}
        choices={choices.rules.map((r) => ({ value: r.id, label: r.name }))}
      />
      {source === 'disputes' ? (
        <>
          <ChoiceChips<RangePreset>
            label="Disputes resolved in"
            value={range.preset}
            onChange={(preset) => setRange({ ...range, preset })}
            choices={[
              { value: '30d', label: 'Last 30 days' },
              { value: '90d', label: 'Last 90 days' },
              { value: 'custom', label: 'Other dates' },
            ]}
          />
          {range.preset === 'custom' ? (
            <View style={styles.dates}>
              <TextField label="First day (YYYY-MM-DD, UTC)" value={range.customFrom} onChangeText={(t) => setRange({ ...range, customFrom: t.trim() })} autoCapitalize="none" placeholder="2026-09-01" />
              <TextField label="Last day (inclusive)" value={range.customTo} onChangeText={(t) => setRange({ ...range, customTo: t.trim() })} autoCapitalize="none" placeholder="2026-11-30" error={range.customFrom && range.customTo ? rangeProblem(range) ?? undefined : undefined} />
            </View>
          ) : null}
        </>
      ) : ruleId ? (
        <TrialChooser ruleId={ruleId} versionId={versionId} onVersion={setVersionId} trialId={trialId} onTrial={setTrialId} />
      ) : null}

      {query === null ? (
        <AppText tone="muted">{source === 'disputes' ? 'Choose a rule to compare its verdicts with the judgements of resolved disputes.' : 'Choose a rule, one of its versions and a finished trial.'}</AppText>
      ) : result.isPending ? (
        <LoadingState label="Comparing verdicts with judgements…" />
      ) : result.isError ? (
        <ErrorState error={result.error} onRetry={() => result.refetch()} />
      ) : (
        <>
          {result.isFetching ? <ActivityIndicator color={colors.steel} accessibilityLabel="Updating the figures" /> : null}
          <AgreementFigures result={result.data} />
        </>
      )}
    </Card>
  );
}

const styles = StyleSheet.create({
  card: { gap: space.md },
  dates: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
});
