import { StyleSheet, View } from 'react-native';
import { describePage } from '../lib/format';
import { space } from '../lib/theme';
import { AppText } from './AppText';
import { Button } from './Button';

interface PaginationProps {
  offset: number;
  limit: number;
  shown: number;
  total: number;
  /** What is being counted, for the spoken summary ("users"). */
  noun: string;
  onChange: (offset: number) => void;
}

export function Pagination({ offset, limit, shown, total, noun, onChange }: PaginationProps) {
  const hasPrevious = offset > 0;
  const hasNext = offset + shown < total;
  return (
    <View style={styles.row}>
      <AppText tone="muted" role="status" aria-live="polite">{`${describePage(offset, shown, total)} ${noun}`}</AppText>
      <View style={styles.buttons}>
        <Button label="Previous" variant="secondary" compact disabled={!hasPrevious} onPress={() => onChange(Math.max(0, offset - limit))} accessibilityLabel={`Previous page of ${noun}`} />
        <Button label="Next" variant="secondary" compact disabled={!hasNext} onPress={() => onChange(offset + limit)} accessibilityLabel={`Next page of ${noun}`} />
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  row: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', justifyContent: 'space-between', gap: space.md },
  buttons: { flexDirection: 'row', gap: space.sm },
});
