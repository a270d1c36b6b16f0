import { StyleSheet, View } from 'react-native';
import { colors, radius, space } from '../../lib/theme';
import { SIGNATURE_MEANING_LABELS, type Signature } from '../../shared/api/rules';
import { AppText } from '../AppText';

// Date, time and time zone, so that the moment of signing reads the same wherever the record is opened.
const signedAtFormat = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeStyle: 'long' });

function meaningLabel(meaning: string): string {
  return SIGNATURE_MEANING_LABELS[meaning as keyof typeof SIGNATURE_MEANING_LABELS] ?? meaning;
}

/** The signature manifestation: printed name, date and time, meaning, and whether it still matches the content. */
export function SignatureList({ signatures }: { signatures: Signature[] }) {
  if (signatures.length === 0) return <AppText tone="muted">Not signed yet.</AppText>;
  return (
    <View style={styles.list} role="list" aria-label="Signatures">
      {signatures.map((s) => (
        <View key={s.id} role="listitem" style={[styles.item, !s.valid && styles.invalid]}>
          <AppText variant="bodyStrong">{s.signerName}</AppText>
          <AppText>{`${meaningLabel(s.meaning)} · ${signedAtFormat.format(new Date(s.signedAt))}`}</AppText>
          <AppText variant="label" tone={s.valid ? 'notice' : 'danger'}>
            {s.valid ? '✓ Valid: matches the signed content' : '✕ Invalid: the content no longer matches what was signed'}
          </AppText>
          <AppText variant="caption" tone="muted" selectable>{`Content ${s.contentHash.slice(0, 16)}… · signature ${s.signatureHash.slice(0, 16)}…`}</AppText>
        </View>
      ))}
    </View>
  );
}

const styles = StyleSheet.create({
  list: { gap: space.sm },
  item: { gap: space.xxs, padding: space.md, borderRadius: radius.md, borderWidth: 1, borderColor: colors.line, backgroundColor: colors.surfaceMuted },
  invalid: { borderColor: colors.danger, borderLeftWidth: 4 },
});
