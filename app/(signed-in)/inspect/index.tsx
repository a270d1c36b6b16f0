import { AreaEmptyScreen } from '../../../components/AreaEmptyScreen';

export default function InspectRoute() {
  return <AreaEmptyScreen area="inspect" />;
}
