import { StyleSheet, View } from 'react-native';
import { radius, space } from '../../lib/theme';
import { AppText } from '../AppText';
import { CHART_LOOK } from './chartLook';

function Swatch({ kind }: { kind: 'share' | 'signal' | 'centre' | 'limits' }) {
  if (kind === 'share') return <View style={[styles.dot, { backgroundColor: CHART_LOOK.share.colour }]} />;
  if (kind === 'signal') return <View style={[styles.square, { backgroundColor: CHART_LOOK.signal.colour }]} />;
  if (kind === 'centre') return <View style={[styles.solid, { backgroundColor: CHART_LOOK.centre.colour }]} />;
  return (
    <View style={styles.dashes}>
      {[0, 1, 2].map((i) => (
        <View key={i} style={[styles.dash, { backgroundColor: CHART_LOOK.limits.colour }]} />
      ))}
    </View>
  );
}

const ENTRIES = [
  { kind: 'share', text: 'share failed (p)' },
  { kind: 'signal', text: 'signal: a run rule fired' },
  { kind: 'centre', text: 'centre line p̄' },
  { kind: 'limits', text: 'control limits (UCL, LCL)' },
] as const;

/** What each mark on the control chart means, drawn with the same shapes as the chart. */
export function ChartLegend() {
  return (
    <View style={styles.legend}>
      {ENTRIES.map((entry) => (
        <View key={entry.kind} style={styles.entry}>
          <View style={styles.swatchBox} aria-hidden>
            <Swatch kind={entry.kind} />
          </View>
          <AppText variant="caption" tone="muted">
            {entry.text}
          </AppText>
        </View>
      ))}
    </View>
  );
}

const styles = StyleSheet.create({
  legend: { flexDirection: 'row', flexWrap: 'wrap', columnGap: space.lg, rowGap: space.xs },
  entry: { flexDirection: 'row', alignItems: 'center', gap: space.xs },
  swatchBox: { width: 22, alignItems: 'center', justifyContent: 'center' },
  dot: { width: 10, height: 10, borderRadius: radius.pill },
  square: { width: 12, height: 12 },
  solid: { width: 20, height: 2 },
  dashes: { flexDirection: 'row', gap: 2 },
  dash: { width: 6, height: 2 },
});
