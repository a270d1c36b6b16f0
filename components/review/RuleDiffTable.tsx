import { StyleSheet, View } from 'react-native';
import { useLayout } from '../../hooks/useLayout';
import type { DiffRow } from '../../shared/rules/diff';
import { colors, radius, space } from '../../lib/theme';
import { AppText } from '../AppText';

const CHANGE_WORDS: Record<DiffRow['change'], string> = { same: '', changed: '● changed', added: '+ added', removed: '− removed' };

interface RuleDiffTableProps {
  rows: DiffRow[];
  beforeTitle: string;
  afterTitle: string;
}

/** Released and proposed side by side; changed rows are marked in words and with a left bar. */
export function RuleDiffTable({ rows, beforeTitle, afterTitle }: RuleDiffTableProps) {
  const layout = useLayout();
  const sections = ['Settings', 'Steps', 'Gauges'] as const;
  const changes = rows.filter((r) => r.change !== 'same').length;
  return (
    <View style={styles.table}>
      <AppText tone="muted">{changes === 0 ? 'No differences from the released version.' : `${changes} difference${changes === 1 ? '' : 's'} from the released version.`}</AppText>
      {sections.map((section) => (
        <View key={section} style={styles.section}>
          <AppText variant="bodyStrong">{section}</AppText>
          {layout === 'wide' ? (
            <View style={[styles.row, styles.headerRow]}>
              <AppText variant="label" style={styles.labelCell}>What</AppText>
              <AppText variant="label" style={styles.cell}>{beforeTitle}</AppText>
              <AppText variant="label" style={styles.cell}>{afterTitle}</AppText>
            </View>
          ) : null}
          {rows
            .filter((r) => r.section === section)
            .map((r) => (
              <View key={r.label} style={[styles.row, layout === 'phone' && styles.rowPhone, r.change !== 'same' && styles.rowChanged]}>
                <View style={layout === 'phone' ? styles.labelCellPhone : styles.labelCell}>
                  <AppText variant="label">{r.label}</AppText>
                  {r.change !== 'same' ? <AppText variant="caption" tone="caution">{CHANGE_WORDS[r.change]}</AppText> : null}
                </View>
                <AppText style={layout === 'wide' && styles.cell} tone={r.before === null ? 'muted' : 'default'} selectable>
                  {layout === 'phone' ? `${beforeTitle}: ${r.before ?? '(none)'}` : r.before ?? '(none)'}
                </AppText>
                <AppText style={layout === 'wide' && styles.cell} tone={r.after === null ? 'muted' : 'default'} selectable>
                  {layout === 'phone' ? `${afterTitle}: ${r.after ?? '(none)'}` : r.after ?? '(none)'}
                </AppText>
              </View>
            ))}
        </View>
      ))}
    </View>
  );
}

const styles = StyleSheet.create({
  table: { gap: space.lg },
  section: { gap: space.xxs },
  row: { flexDirection: 'row', gap: space.md, paddingVertical: space.sm, paddingHorizontal: space.sm, borderBottomWidth: 1, borderColor: colors.line, borderLeftWidth: 4, borderLeftColor: 'transparent' },
  rowPhone: { flexDirection: 'column', gap: space.xxs },
  headerRow: { backgroundColor: colors.surfaceSunken, borderRadius: radius.sm },
  rowChanged: { borderLeftColor: colors.caution, backgroundColor: colors.cautionTint },
  labelCell: { flexBasis: 180, flexShrink: 0, gap: space.xxs },
  labelCellPhone: { gap: space.xxs },
  cell: { flex: 1 },
});
