import { AreaEmptyScreen } from '../../../components/AreaEmptyScreen';

export default function StationsRoute() {
  return <AreaEmptyScreen area="stations" />;
}
