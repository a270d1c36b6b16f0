import { StyleSheet, View } from 'react-native';
import { colors, radius, space } from '../../lib/theme';
import { AppText } from '../AppText';
import { Card } from '../Card';

/** Sending the photo, then waiting while the rule runs on the server. */
export function UploadProgress({ fraction }: { fraction: number }) {
  const percent = Math.round(Math.min(1, Math.max(0, fraction)) * 100);
  const judging = percent >= 100;
  return (
    <Card style={styles.card}>
      <AppText variant="heading">{judging ? 'Judging the part…' : `Sending the photo… ${percent} %`}</AppText>
      <View
        role="progressbar"
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={percent}
        aria-label="Photo upload"
        style={styles.track}
      >
        <View style={[styles.fill, { width: `${percent}%` }]} />
      </View>
      <AppText variant="caption" tone="muted">
        {judging ? 'The released rule runs on the server; the verdict appears here.' : 'Keep this screen open until the verdict appears.'}
      </AppText>
    </Card>
  );
}

const styles = StyleSheet.create({
  card: { gap: space.md },
  track: { height: 12, borderRadius: radius.pill, backgroundColor: colors.surfaceSunken, overflow: 'hidden' },
  fill: { height: '100%', backgroundColor: colors.steel },
});
