// The filters above a list. On a phone they fold into one line that says what is chosen, so that
// the list starts on the first screen; "Change filters" opens them and "Done" folds them again.
import { useState, type ReactNode } from 'react';
import { StyleSheet, type StyleProp, type ViewStyle } from 'react-native';
import { space } from '../lib/theme';
import { AppText } from './AppText';
import { Button } from './Button';
import { Card } from './Card';

interface FilterPanelProps {
  /** What is chosen, in words, for the folded line ("FAIL only · all stations · …"). */
  summary: string;
  /** Fold on this screen (a phone); open for good otherwise. */
  foldable: boolean;
  children: ReactNode;
  style?: StyleProp<ViewStyle>;
}

export function FilterPanel({ summary, foldable, children, style }: FilterPanelProps) {
  const [open, setOpen] = useState(!foldable);
  if (foldable && !open) {
    return (
      <Card style={styles.folded}>
        <AppText variant="caption" tone="muted" style={styles.summary}>{summary}</AppText>
        <Button label="Change filters" variant="secondary" compact expanded={false} onPress={() => setOpen(true)} accessibilityHint="Shows the filter choices" />
      </Card>
    );
  }
  return (
    <Card style={[styles.card, style]}>
      {children}
      {foldable ? <Button label="Done" variant="secondary" expanded onPress={() => setOpen(false)} accessibilityHint="Folds the filters into one line" /> : null}
    </Card>
  );
}

const styles = StyleSheet.create({
  card: { gap: space.md },
  folded: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: space.sm },
  summary: { flexGrow: 1, flexShrink: 1, flexBasis: 200 },
});
