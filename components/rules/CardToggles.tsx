// "Open every step" / "Close every step" above an editor's list of cards (shown from two cards up).
import { StyleSheet } from 'react-native';
import { Button } from '../Button';

export function OpenAllButton({ noun, count, allOpen, onPress }: { noun: string; count: number; allOpen: boolean; onPress: (open: boolean) => void }) {
  if (count < 2) return null;
  return <Button label={allOpen ? `Close every ${noun}` : `Open every ${noun}`} compact variant="quiet" expanded={allOpen} style={styles.start} onPress={() => onPress(!allOpen)} />;
}

/** The Edit / Done button of one card: `name` is the card's accessible name ("Step 2: Kernel"). */
export function EditToggle({ name, open, held, onPress }: { name: string; open: boolean; held: boolean; onPress: (open: boolean) => void }) {
  return (
    <Button
      label={open ? 'Done' : 'Edit'}
      compact
      variant="quiet"
      expanded={open}
      disabled={held}
      accessibilityLabel={`${open ? 'Done editing' : 'Edit'} ${name}`}
      accessibilityHint={held ? 'Stays open while a setting has a problem or a region is being drawn' : undefined}
      onPress={() => onPress(!open)}
    />
  );
}

const styles = StyleSheet.create({ start: { alignSelf: 'flex-start' } });
