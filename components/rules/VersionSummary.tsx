// A rule version's content, read-only: its steps and its gauges with limits.
import { StyleSheet, View } from 'react-native';
import type { Gauge, Step } from '../../shared/rules/schema';
import { space } from '../../lib/theme';
import { AppText } from '../AppText';
import { describeLimits } from '../../shared/rules/units';
import { MEASURE_LABELS } from '../../shared/rules/words';
import { describeStep, STEP_DESCRIPTIONS } from './stepCatalogue';

export function VersionSummary({ document }: { document: unknown }) {
  const doc = (document ?? {}) as { steps?: Step[]; gauges?: Gauge[] };
  return (
    <View style={styles.list}>
      <AppText variant="label">Pipeline</AppText>
      {(doc.steps ?? []).map((step, i) => (
        <AppText key={i}>{`${i + 1}. ${STEP_DESCRIPTIONS[step.op]?.title ?? step.op} — ${describeStep(step)}`}</AppText>
      ))}
      <AppText variant="label">Gauges</AppText>
      {(doc.gauges ?? []).map((g) => (
        <AppText key={g.name}>{`${g.name}: ${MEASURE_LABELS[g.measure]}, ${describeLimits(g.limits.min, g.limits.max, g.unit)}${g.region ? `, in a ${g.region.shape === 'rect' ? 'rectangle' : 'circle'}` : ''}`}</AppText>
      ))}
    </View>
  );
}

const styles = StyleSheet.create({ list: { gap: space.xs } });
