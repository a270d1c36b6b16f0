import { AreaGate } from '../../../components/AreaGate';
import { ReviewArea } from '../../../components/review/ReviewArea';

export default function ReviewRoute() {
  return (
    <AreaGate area="review">
      <ReviewArea />
    </AreaGate>
  );
}
