// Whether the chosen station's camera can see the smallest defect the rule must catch.
import { StyleSheet, View } from 'react-native';
import { samplingCheck } from '../../shared/calibration';
import { colors, radius, space } from '../../lib/theme';
import { AppText } from '../AppText';

export function SamplingNotice({ smallestDefectMm, mmPerPx, stationName }: { smallestDefectMm: number | null; mmPerPx: number | null; stationName: string | null }) {
  if (smallestDefectMm === null) return <AppText variant="caption" tone="muted">State the smallest defect to catch (in the rule’s details) to check that the camera can see it.</AppText>;
  if (mmPerPx === null || stationName === null) return <AppText variant="caption" tone="muted">Choose a calibrated station to check the smallest defect’s size in pixels.</AppText>;
  const check = samplingCheck(smallestDefectMm, mmPerPx);
  const look = check.verdict === 'ok' ? styles.ok : check.verdict === 'below-recommended' ? styles.caution : styles.refuse;
  const heading = check.verdict === 'ok' ? '✓ The camera can see the smallest defect' : check.verdict === 'below-recommended' ? '⚠ The smallest defect is barely visible' : '✕ The camera cannot see the smallest defect';
  return (
    <View style={[styles.box, look]} accessibilityRole={check.verdict === 'ok' ? undefined : 'alert'}>
      <AppText variant="label" tone={check.verdict === 'ok' ? 'notice' : check.verdict === 'below-recommended' ? 'caution' : 'danger'}>{heading}</AppText>
      <AppText variant="caption">{`${stationName} (${mmPerPx.toPrecision(3)} mm per pixel): ${check.message}`}</AppText>
    </View>
  );
}

const styles = StyleSheet.create({
  box: { gap: space.xxs, padding: space.sm, borderLeftWidth: 4, borderRadius: radius.sm },
  ok: { borderLeftColor: colors.notice, backgroundColor: colors.noticeTint },
  caution: { borderLeftColor: colors.caution, backgroundColor: colors.cautionTint },
  refuse: { borderLeftColor: colors.danger, backgroundColor: colors.dangerTint, borderLeftWidth: 8 },
});
