import { AreaGate } from '../../../components/AreaGate';
import { TrendsArea } from '../../../components/trends/TrendsArea';

export default function TrendsRoute() {
  return (
    <AreaGate area="trends">
      <TrendsArea />
    </AreaGate>
  );
}
