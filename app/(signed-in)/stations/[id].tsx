import { useLocalSearchParams } from 'expo-router';
import { AreaGate } from '../../../components/AreaGate';
import { CalibrationScreen } from '../../../components/stations/CalibrationScreen';

export default function StationCalibrationRoute() {
  const { id } = useLocalSearchParams<{ id: string }>();
  return (
    <AreaGate area="stations">
      <CalibrationScreen stationId={String(id)} />
    </AreaGate>
  );
}
