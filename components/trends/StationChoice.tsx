import { StyleSheet, View } from 'react-native';
import { space } from '../../lib/theme';
import { AppText } from '../AppText';
import { ChoiceChips } from '../ChoiceChips';
import { FieldError } from '../FieldError';

interface StationChoiceProps {
  lines: readonly { id: string; name: string; stations: readonly { id: string; name: string }[] }[];
  value: string | null;
  onChange: (stationId: string | null) => void;
  /** The words for "no one station", when that is a choice (e.g. "Every station"). */
  anyLabel?: string;
  error?: string;
}

/** One station, its chips grouped under their line so that each chip stays short on a phone. */
export function StationChoice({ lines, value, onChange, anyLabel, error }: StationChoiceProps) {
  return (
    <View style={styles.column}>
      {anyLabel ? <ChoiceChips<string | null> label="Station" value={value} onChange={onChange} choices={[{ value: null, label: anyLabel }]} /> : <AppText variant="label">Station</AppText>}
      {lines
        .filter((line) => line.stations.length > 0)
        .map((line) => (
          <ChoiceChips<string | null> key={line.id} label={line.name} value={value} onChange={onChange} choices={line.stations.map((s) => ({ value: s.id, label: s.name }))} />
        ))}
      <FieldError error={error} />
    </View>
  );
}

const styles = StyleSheet.create({
  column: { gap: space.sm },
});
