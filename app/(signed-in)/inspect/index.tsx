import { AreaGate } from '../../../components/AreaGate';
import { InspectScreen } from '../../../components/inspect/InspectScreen';

export default function InspectRoute() {
  return (
    <AreaGate area="inspect">
      <InspectScreen />
    </AreaGate>
  );
}
