import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { useLayout } from '../../hooks/useLayout';
import type { DiffRow } from '../../shared/rules/diff';
import { colors, radius, space } from '../../lib/theme';
import { AppText } from '../AppText';
import { ChoiceChips } from '../ChoiceChips';

const CHANGE_WORDS: Record<DiffRow['change'], string> = { same: '', changed: '● changed', added: '+ added', removed: '− removed' };

interface RuleDiffTableProps {
  rows: DiffRow[];
  /** The version compared with; null when there is none (a rule's first version). */
  beforeTitle: string | null;
  afterTitle: string;
}

const SECTIONS = ['Settings', 'Steps', 'Gauges'] as const;

/**
 * Released and proposed side by side, one table per section; changed rows are marked in words and
 * with a left bar, and are all that is shown until the reviewer asks for everything. On a phone the
 * row's name sits above its two values, which stay side by side. A first version is shown whole.
 */
export function RuleDiffTable({ rows, beforeTitle, afterTitle }: RuleDiffTableProps) {
  const phone = useLayout() === 'phone';
  const compared = beforeTitle !== null;
  const changes = compared ? rows.filter((r) => r.change !== 'same').length : 0;
  const [onlyChanges, setOnlyChanges] = useState(true);
  const filtering = compared && changes > 0 && onlyChanges;
  const shown = filtering ? rows.filter((r) => r.change !== 'same') : rows;
  const titles = compared ? [beforeTitle, afterTitle] : [afterTitle];
  return (
    <View style={styles.table}>
      <AppText tone="muted">
        {!compared
          ? 'The first version of this rule: nothing to compare it with, so all of it is shown.'
          : changes === 0
            ? 'No differences from the released version.'
            : `${changes} difference${changes === 1 ? '' : 's'} from the released version.`}
      </AppText>
      {compared && changes > 0 ? (
        <ChoiceChips<boolean>
          label="Show"
          choices={[
            { value: true, label: changes === 1 ? 'The difference' : `The ${changes} differences` },
            { value: false, label: 'Every setting, step and gauge' },
          ]}
          value={onlyChanges}
          onChange={setOnlyChanges}
        />
      ) : null}
      {SECTIONS.map((section) => {
        const sectionRows = shown.filter((r) => r.section === section);
        if (sectionRows.length === 0) return null;
        return (
          <View key={section} style={styles.section} role="table" aria-label={compared ? `${section}: ${beforeTitle} against ${afterTitle}` : `${section} of ${afterTitle}`}>
            <AppText variant="bodyStrong">{section}</AppText>
            <View style={[styles.row, styles.headerRow]} role="row">
              {phone ? null : <AppText variant="label" style={styles.labelCell} role="columnheader">What</AppText>}
              {titles.map((title) => (
                <AppText key={title} variant="label" style={styles.cell} role="columnheader">{title}</AppText>
              ))}
            </View>
            {sectionRows.map((r) => (
              <View key={r.label} role="row" style={[styles.row, phone && styles.rowPhone, compared && r.change !== 'same' && styles.rowChanged]}>
                <View style={phone ? styles.labelCellPhone : styles.labelCell} role="rowheader">
                  <AppText variant="label">{r.label}</AppText>
                  {compared && r.change !== 'same' ? <AppText variant="caption" tone="caution">{CHANGE_WORDS[r.change]}</AppText> : null}
                </View>
                <View style={[styles.values, !phone && styles.valuesWide]}>
                  {compared ? (
                    <AppText style={styles.cell} role="cell" tone={r.before === null ? 'muted' : 'default'} selectable>
                      {r.before ?? '(none)'}
                    </AppText>
                  ) : null}
                  <AppText style={styles.cell} role="cell" tone={r.after === null ? 'muted' : 'default'} selectable>
                    {r.after ?? '(none)'}
                  </AppText>
                </View>
              </View>
            ))}
          </View>
        );
      })}
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
  values: { flexGrow: 1, flexShrink: 1, flexDirection: 'row', gap: space.md },
  valuesWide: { flexBasis: 0 },
  cell: { flex: 1, flexBasis: 0, minWidth: 0 },
});
