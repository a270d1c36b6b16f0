import { AreaEmptyScreen } from '../../../components/AreaEmptyScreen';

export default function ReferenceSetsRoute() {
  return <AreaEmptyScreen area="reference-sets" />;
}
