// A verdict told three ways: the word, a shape of its own, and only then a colour.
import { StyleSheet, View } from 'react-native';
import { colors } from '../../lib/theme';
import type { Inspection } from '../../shared/api/inspections';
import { AppText } from '../AppText';

export type Verdict = Inspection['verdict'];

export const VERDICT_LOOK: Record<Verdict, { symbol: string; colour: string; tint: string; shapeName: string }> = {
  PASS: { symbol: '✓', colour: colors.notice, tint: colors.noticeTint, shapeName: 'circle with a tick' },
  FAIL: { symbol: '✕', colour: colors.danger, tint: colors.dangerTint, shapeName: 'square with a cross' },
  RETAKE: { symbol: '↻', colour: colors.caution, tint: colors.cautionTint, shapeName: 'diamond with a turning arrow' },
};

/** PASS a circle, FAIL a square, RETAKE a diamond; each carries its own symbol. */
export function VerdictMark({ verdict, size = 96 }: { verdict: Verdict; size?: number }) {
  const look = VERDICT_LOOK[verdict];
  const shapeStyle =
    verdict === 'PASS' ? { borderRadius: size / 2 } : verdict === 'FAIL' ? { borderRadius: 0 } : { borderRadius: 0, transform: [{ rotate: '45deg' }], width: size * 0.78, height: size * 0.78 };
  return (
    <View style={[styles.box, { width: size, height: size }]} aria-hidden>
      <View style={[styles.shape, { width: size, height: size, borderColor: look.colour, backgroundColor: look.colour }, shapeStyle]} />
      <AppText style={[styles.symbol, { fontSize: size * 0.5, lineHeight: size * 0.6 }]} tone="onSteel">
        {look.symbol}
      </AppText>
    </View>
  );
}

const styles = StyleSheet.create({
  box: { alignItems: 'center', justifyContent: 'center' },
  shape: { position: 'absolute', borderWidth: 3 },
  symbol: { fontWeight: '700' },
});
