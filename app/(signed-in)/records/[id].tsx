import { useLocalSearchParams } from 'expo-router';
import { AreaGate } from '../../../components/AreaGate';
import { InspectionRecord } from '../../../components/records/InspectionRecord';

export default function InspectionRecordRoute() {
  const { id } = useLocalSearchParams<{ id: string }>();
  return (
    <AreaGate area="records">
      <InspectionRecord id={String(id)} />
    </AreaGate>
  );
}
