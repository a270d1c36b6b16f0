import { useLocalSearchParams } from 'expo-router';
import { AreaGate } from '../../../components/AreaGate';
import { RulePage } from '../../../components/rules/RulePage';

export default function RuleRoute() {
  const { id } = useLocalSearchParams<{ id: string }>();
  return (
    <AreaGate area="rules">
      <RulePage id={String(id)} />
    </AreaGate>
  );
}
