import { AreaEmptyScreen } from '../../../components/AreaEmptyScreen';

export default function TrendsRoute() {
  return <AreaEmptyScreen area="trends" />;
}
