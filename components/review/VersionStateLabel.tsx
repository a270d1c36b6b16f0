import { StyleSheet, View } from 'react-native';
import { colors, radius, space } from '../../lib/theme';
import type { RuleVersionState } from '../../shared/api/rules';
import { AppText } from '../AppText';

const LABELS: Record<RuleVersionState, { symbol: string; text: string }> = {
  draft: { symbol: '✎', text: 'Draft' },
  'in-review': { symbol: '◷', text: 'In review' },
  released: { symbol: '✓', text: 'Released' },
  superseded: { symbol: '⇢', text: 'Superseded' },
  withdrawn: { symbol: '⊘', text: 'Withdrawn' },
};

/** A version's state in words with a symbol, never by colour alone. */
export function VersionStateLabel({ state }: { state: RuleVersionState }) {
  const label = LABELS[state];
  return (
    <View style={styles.pill}>
      <AppText variant="label">{`${label.symbol} ${label.text}`}</AppText>
    </View>
  );
}

const styles = StyleSheet.create({
  pill: {
    alignSelf: 'flex-start',
    paddingHorizontal: space.sm,
    paddingVertical: space.xxs,
    borderRadius: radius.pill,
    borderWidth: 1,
    borderColor: colors.control,
    backgroundColor: colors.surface,
  },
});
