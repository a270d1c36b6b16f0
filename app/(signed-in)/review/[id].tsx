import { useLocalSearchParams } from 'expo-router';
import { AreaGate } from '../../../components/AreaGate';
import { VersionReview } from '../../../components/review/VersionReview';

export default function ReviewVersionRoute() {
  const { id } = useLocalSearchParams<{ id: string }>();
  return (
    <AreaGate area="review">
      <VersionReview versionId={String(id)} />
    </AreaGate>
  );
}
