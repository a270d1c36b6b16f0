import { HomeScreen } from '../../components/HomeScreen';

export default function HomeRoute() {
  return <HomeScreen />;
}
