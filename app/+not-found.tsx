import { NotFoundScreen } from '../components/NotFoundScreen';

export default function NotFoundRoute() {
  return <NotFoundScreen />;
}
