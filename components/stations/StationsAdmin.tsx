import { useState } from 'react';
import { useRouter } from 'expo-router';
import { StyleSheet, View } from 'react-native';
import { usePartTypes } from '../../hooks/useReferenceSets';
import { useCreateLine, useCreateStation, useLines, useUpdateStation } from '../../hooks/useStations';
import { space } from '../../lib/theme';
import type { Station } from '../../shared/api/stations';
import { AppText } from '../AppText';
import { Button } from '../Button';
import { Card } from '../Card';
import { ErrorBanner } from '../ErrorBanner';
import { Screen } from '../Screen';
import { EmptyState, ErrorState, LoadingState } from '../StateViews';
import { UserStatus } from '../users/UserStatus';
import { CalibrationSummary } from './CalibrationSummary';
import { PartTypesSummary } from './PartTypesSummary';
import { LineDialog } from './LineDialog';
import { StationFormDialog, type StationFormValues } from './StationFormDialog';

type Editing = { kind: 'new-line' } | { kind: 'new-station'; lineId: string } | { kind: 'edit-station'; station: Station } | null;

/** Lines and their stations, with each station's calibration; supervisors and administrators keep them current. */
export function StationsAdmin() {
  const router = useRouter();
  const lines = useLines();
  const partTypes = usePartTypes();
  const createLine = useCreateLine();
  const createStation = useCreateStation();
  const updateStation = useUpdateStation();
  const [editing, setEditing] = useState<Editing>(null);
  const close = () => {
    setEditing(null);
    createLine.reset();
    createStation.reset();
    updateStation.reset();
  };

  const saveStation = (values: StationFormValues) => {
    if (editing?.kind === 'edit-station') {
      const { station } = editing;
      updateStation.mutate({ id: station.id, changes: { name: values.name, cameraNote: values.cameraNote, active: values.active, partTypes: values.partTypes } }, { onSuccess: close });
    } else {
      createStation.mutate({ lineId: values.lineId, name: values.name, cameraNote: values.cameraNote, partTypes: values.partTypes }, { onSuccess: close });
    }
  };

  return (
    <Screen title="Stations" subtitle="Each station’s calibration turns pixels into millimetres for every gauge measured there; its part types decide which released rules its operators are offered." actions={<Button label="New line" onPress={() => setEditing({ kind: 'new-line' })} />}>
      {partTypes.error ? <ErrorBanner error={partTypes.error} onRetry={() => void partTypes.refetch()} /> : null}
      {lines.isPending ? (
        <LoadingState label="Loading lines and stations…" />
      ) : lines.error ? (
        <ErrorState error={lines.error} onRetry={() => void lines.refetch()} />
      ) : lines.data.length === 0 ? (
        <EmptyState title="No stations yet" body="Add a line first, then the stations on it. Calibrate each station before its gauges report millimetres." />
      ) : (
        lines.data.map((line) => (
          <View key={line.id} style={styles.line}>
            <View style={styles.lineHead}>
              <AppText variant="heading">{line.name}</AppText>
              <Button label="Add station" variant="secondary" compact onPress={() => setEditing({ kind: 'new-station', lineId: line.id })} accessibilityLabel={`Add a station to ${line.name}`} />
            </View>
            {line.stations.length === 0 ? <AppText tone="muted">No stations on this line yet.</AppText> : null}
            <View style={styles.grid}>
              {line.stations.map((station) => (
                <Card key={station.id} style={styles.station}>
                  <View style={styles.stationHead}>
                    <AppText variant="bodyStrong">{station.name}</AppText>
                    <UserStatus active={station.active} />
                  </View>
                  {station.cameraNote ? <AppText variant="caption" tone="muted">{station.cameraNote}</AppText> : null}
                  <CalibrationSummary station={station} />
                  <PartTypesSummary station={station} catalogue={partTypes.data} />
                  <View style={styles.actions}>
                    <Button label="Edit" variant="secondary" compact onPress={() => setEditing({ kind: 'edit-station', station })} accessibilityLabel={`Edit ${station.name}`} />
                    <Button label="Calibrate" compact onPress={() => router.push(`/stations/${station.id}`)} accessibilityLabel={`Calibrate ${station.name}`} />
                  </View>
                </Card>
              ))}
            </View>
          </View>
        ))
      )}
      <LineDialog
        visible={editing?.kind === 'new-line'}
        busy={createLine.isPending}
        error={createLine.error}
        onClose={close}
        onSave={(name) => createLine.mutate({ name }, { onSuccess: close })}
      />
      <StationFormDialog
        visible={editing?.kind === 'new-station' || editing?.kind === 'edit-station'}
        station={editing?.kind === 'edit-station' ? editing.station : undefined}
        initialLineId={editing?.kind === 'new-station' ? editing.lineId : undefined}
        lines={lines.data ?? []}
        partTypes={partTypes.data ?? []}
        busy={createStation.isPending || updateStation.isPending}
        error={createStation.error ?? updateStation.error}
        onSave={saveStation}
        onClose={close}
      />
    </Screen>
  );
}

const styles = StyleSheet.create({
  line: { gap: space.md },
  lineHead: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', justifyContent: 'space-between', gap: space.sm },
  grid: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
  station: { flexGrow: 1, flexBasis: 300, gap: space.sm },
  stationHead: { flexDirection: 'row', flexWrap: 'wrap', justifyContent: 'space-between', gap: space.sm },
  actions: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm, justifyContent: 'flex-end' },
});
