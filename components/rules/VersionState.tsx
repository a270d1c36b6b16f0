// A rule version's state in words with a symbol of its own, so it never depends on colour.
import { StyleSheet, View } from 'react-native';
import type { RuleVersionState } from '../../shared/api/rules';
import { colors, radius, space } from '../../lib/theme';
import { AppText } from '../AppText';

export const STATE_WORDS: Record<RuleVersionState, { symbol: string; word: string }> = {
  draft: { symbol: '✎', word: 'Draft' },
  'in-review': { symbol: '◷', word: 'In review' },
  released: { symbol: '✓', word: 'Released' },
  superseded: { symbol: '↷', word: 'Superseded' },
  withdrawn: { symbol: '⊘', word: 'Withdrawn' },
};

/** `sentBack`: isSentBack of the version (a draft returned from review, which waits for the engineer's changes). */
export function VersionState({ state, number, sentBack = false }: { state: RuleVersionState; number?: number; sentBack?: boolean }) {
  const { symbol, word } = sentBack ? SENT_BACK : STATE_WORDS[state];
  return (
    <View style={[styles.pill, state === 'released' && styles.released, state === 'withdrawn' && styles.withdrawn, sentBack && styles.sentBack]}>
      <AppText variant="label" tone={sentBack ? 'caution' : undefined}>{`${symbol} ${number !== undefined ? `v${number} ` : ''}${word}`}</AppText>
    </View>
  );
}

const SENT_BACK = { symbol: '↩', word: 'Draft, sent back' };

const styles = StyleSheet.create({
  pill: { alignSelf: 'flex-start', paddingHorizontal: space.sm, paddingVertical: space.xxs, borderRadius: radius.pill, borderWidth: 1, borderColor: colors.control, backgroundColor: colors.surface },
  released: { borderColor: colors.notice, backgroundColor: colors.noticeTint },
  withdrawn: { borderStyle: 'dashed' },
  sentBack: { borderColor: colors.caution, backgroundColor: colors.cautionTint },
});
