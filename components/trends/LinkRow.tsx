import { Pressable, StyleSheet, View } from 'react-native';
import { colors, minTouchTarget, radius, space } from '../../lib/theme';
import { AppText } from '../AppText';

interface LinkRowProps {
  title: string;
  detail: string;
  /** Spoken in full: where the row leads. */
  accessibilityLabel: string;
  onPress: () => void;
  /** A bar drawn under the words, 0..1 of the row's width (its share), if any. */
  share?: number;
}

/** One line of a list that opens the inspections behind it. */
export function LinkRow({ title, detail, accessibilityLabel, onPress, share }: LinkRowProps) {
  return (
    <Pressable accessibilityRole="link" accessibilityLabel={accessibilityLabel} onPress={onPress} style={({ pressed }) => [styles.row, pressed && styles.pressed]}>
      <View style={styles.text}>
        <AppText variant="bodyStrong">{title}</AppText>
        <AppText variant="caption" tone="muted">
          {detail}
        </AppText>
        {share !== undefined ? (
          <View style={styles.track} aria-hidden>
            <View style={[styles.fill, { width: `${Math.round(Math.min(1, Math.max(0, share)) * 100)}%` }]} />
          </View>
        ) : null}
      </View>
      <AppText variant="label" tone="steel">
        Inspections ›
      </AppText>
    </Pressable>
  );
}

const styles = StyleSheet.create({
  row: { flexDirection: 'row', alignItems: 'center', gap: space.md, minHeight: minTouchTarget, paddingVertical: space.sm, paddingHorizontal: space.sm, borderRadius: radius.md, borderBottomWidth: 1, borderBottomColor: colors.line },
  pressed: { backgroundColor: colors.steelTint },
  text: { flex: 1, gap: space.xxs },
  track: { height: 4, borderRadius: radius.pill, backgroundColor: colors.surfaceSunken, overflow: 'hidden' },
  fill: { height: 4, backgroundColor: colors.steelMid },
});
