import { StyleSheet, View } from 'react-native';
import { colors } from '../lib/theme';
import { AppText } from './AppText';

// A 3 x 3 kernel whose centre cell is the pixel being judged.
const CELLS = [0, 1, 2, 3, 4, 5, 6, 7, 8];

interface MarkProps {
  size?: number;
  inverted?: boolean;
  /** Beside the written name the mark is decoration and stays silent. */
  decorative?: boolean;
}

export function KernwrightMark({ size = 28, inverted = false, decorative = false }: MarkProps) {
  const gap = Math.max(1, Math.round(size / 14));
  const cell = (size - gap * 4) / 3;
  const frame = inverted ? colors.onSteel : colors.steel;
  return (
    <View
      {...(decorative ? { 'aria-hidden': true } : { accessibilityRole: 'image' as const, accessibilityLabel: 'Kernwright' })}
      style={[styles.frame, { width: size, height: size, padding: gap, gap, backgroundColor: frame, borderRadius: size / 6 }]}
    >
      {CELLS.map((index) => (
        <View
          key={index}
          style={{
            width: cell,
            height: cell,
            borderRadius: cell / 5,
            backgroundColor: index === 4 ? (inverted ? colors.steel : colors.paper) : inverted ? colors.steelTint : colors.steelMid,
          }}
        />
      ))}
    </View>
  );
}

export function KernwrightWordmark({ inverted = false }: { inverted?: boolean }) {
  return (
    <View style={styles.wordmark}>
      <KernwrightMark size={30} inverted={inverted} decorative />
      <AppText variant="heading" headingLevel={null} tone={inverted ? 'onSteel' : 'steel'}>
        Kernwright
      </AppText>
    </View>
  );
}

const styles = StyleSheet.create({
  frame: { flexDirection: 'row', flexWrap: 'wrap' },
  wordmark: { flexDirection: 'row', alignItems: 'center', gap: 10 },
});
