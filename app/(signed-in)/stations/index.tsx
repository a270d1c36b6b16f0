import { AreaGate } from '../../../components/AreaGate';
import { StationsAdmin } from '../../../components/stations/StationsAdmin';

export default function StationsRoute() {
  return (
    <AreaGate area="stations">
      <StationsAdmin />
    </AreaGate>
  );
}
