import { AreaEmptyScreen } from '../../../components/AreaEmptyScreen';

export default function RecordsRoute() {
  return <AreaEmptyScreen area="records" />;
}
