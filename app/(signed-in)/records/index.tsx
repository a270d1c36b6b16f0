import { AreaGate } from '../../../components/AreaGate';
import { RecordsScreen } from '../../../components/records/RecordsScreen';

export default function RecordsRoute() {
  return (
    <AreaGate area="records">
      <RecordsScreen />
    </AreaGate>
  );
}
