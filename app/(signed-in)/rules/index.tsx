import { AreaGate } from '../../../components/AreaGate';
import { RulesList } from '../../../components/rules/RulesList';

export default function RulesRoute() {
  return (
    <AreaGate area="rules">
      <RulesList />
    </AreaGate>
  );
}
