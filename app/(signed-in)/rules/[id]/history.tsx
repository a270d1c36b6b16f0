import { useLocalSearchParams } from 'expo-router';
import { AreaGate } from '../../../../components/AreaGate';
import { RuleHistory } from '../../../../components/rules/RuleHistory';

export default function RuleHistoryRoute() {
  const { id, version } = useLocalSearchParams<{ id: string; version?: string }>();
  return (
    <AreaGate area="rules">
      <RuleHistory ruleId={String(id)} focusVersionId={version ? String(version) : undefined} />
    </AreaGate>
  );
}
