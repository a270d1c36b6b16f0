// An AIAG acceptance decision told by its word and its shape, with colour only as a third cue.
import { StyleSheet, View } from 'react-native';
import { colors, radius, space } from '../../lib/theme';
import type { Acceptance } from '../../shared/api/studies';
import { AppText } from '../AppText';

const LOOK: Record<Acceptance, { symbol: string; word: string; tone: 'notice' | 'caution' | 'danger'; border: string; tint: string }> = {
  acceptable: { symbol: '✓', word: 'Acceptable', tone: 'notice', border: colors.notice, tint: colors.noticeTint },
  marginal: { symbol: '△', word: 'Marginal', tone: 'caution', border: colors.caution, tint: colors.cautionTint },
  unacceptable: { symbol: '✕', word: 'Unacceptable', tone: 'danger', border: colors.danger, tint: colors.dangerTint },
};

export function AcceptanceMark({ acceptance }: { acceptance: Acceptance | null }) {
  if (acceptance === null) {
    return (
      <View style={[styles.mark, styles.none]}>
        <AppText variant="label" tone="muted">
          – Not enough data
        </AppText>
      </View>
    );
  }
  const look = LOOK[acceptance];
  return (
    <View style={[styles.mark, { borderColor: look.border, backgroundColor: look.tint }]}>
      <AppText variant="label" tone={look.tone}>{`${look.symbol} ${look.word}`}</AppText>
    </View>
  );
}

const styles = StyleSheet.create({
  mark: { alignSelf: 'flex-start', paddingHorizontal: space.sm, paddingVertical: space.xxs, borderRadius: radius.sm, borderWidth: 1 },
  none: { borderColor: colors.control, backgroundColor: colors.surfaceMuted },
});
