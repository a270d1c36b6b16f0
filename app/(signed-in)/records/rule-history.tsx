import { AreaGate } from '../../../components/AreaGate';
import { RuleHistoryIndex } from '../../../components/records/RuleHistoryIndex';

export default function RuleHistoryIndexRoute() {
  return (
    <AreaGate area="records">
      <RuleHistoryIndex />
    </AreaGate>
  );
}
