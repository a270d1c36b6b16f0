import { useLocalSearchParams } from 'expo-router';
import { AreaGate } from '../../../components/AreaGate';
import { ReferenceSetPage } from '../../../components/references/ReferenceSetPage';

export default function ReferenceSetRoute() {
  const { id } = useLocalSearchParams<{ id: string }>();
  return (
    <AreaGate area="reference-sets">
      <ReferenceSetPage id={String(id)} />
    </AreaGate>
  );
}
