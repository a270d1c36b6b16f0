import { AreaEmptyScreen } from '../../../components/AreaEmptyScreen';

export default function RulesRoute() {
  return <AreaEmptyScreen area="rules" />;
}
