import { AreaEmptyScreen } from '../../../components/AreaEmptyScreen';

export default function ReviewRoute() {
  return <AreaEmptyScreen area="review" />;
}
