import { Pressable, StyleSheet, View } from 'react-native';
import { colors, minTouchTarget, radius, space } from '../../lib/theme';
import { AppText } from '../AppText';

export interface Section<K extends string> {
  key: K;
  title: string;
  /** A count shown beside the title (open alerts), spoken with it. */
  count?: number;
  countLabel?: string;
}

interface SectionTabsProps<K extends string> {
  label: string;
  sections: readonly Section<K>[];
  value: K;
  onChange: (key: K) => void;
}

/** The parts of an area as tabs: the chosen one is underlined and bold, not only coloured. */
export function SectionTabs<K extends string>({ label, sections, value, onChange }: SectionTabsProps<K>) {
  return (
    <View role="tablist" aria-label={label} style={styles.bar}>
      {sections.map((section) => {
        const selected = section.key === value;
        const spoken = section.count ? `${section.title}, ${section.count} ${section.countLabel ?? ''}`.trim() : section.title;
        return (
          <Pressable
            key={section.key}
            role="tab"
            aria-selected={selected}
            accessibilityLabel={spoken}
            onPress={() => onChange(section.key)}
            style={({ pressed }) => [styles.tab, selected && styles.tabSelected, pressed && !selected && styles.tabPressed]}
          >
            <AppText variant="label" tone={selected ? 'steel' : 'muted'} style={selected && styles.titleSelected}>
              {section.title}
            </AppText>
            {section.count ? (
              <View style={styles.badge}>
                <AppText variant="caption" tone="onSteel">
                  {String(section.count)}
                </AppText>
              </View>
            ) : null}
          </Pressable>
        );
      })}
    </View>
  );
}

const styles = StyleSheet.create({
  bar: { flexDirection: 'row', flexWrap: 'wrap', borderBottomWidth: 1, borderBottomColor: colors.control },
  tab: {
    minHeight: minTouchTarget,
    minWidth: minTouchTarget,
    paddingHorizontal: space.sm,
    flexDirection: 'row',
    alignItems: 'center',
    gap: space.xs,
    borderBottomWidth: 3,
    borderBottomColor: 'transparent',
    borderTopLeftRadius: radius.sm,
    borderTopRightRadius: radius.sm,
  },
  tabSelected: { borderBottomColor: colors.steel },
  tabPressed: { backgroundColor: colors.steelTint },
  titleSelected: { fontWeight: '600' },
  badge: { minWidth: 22, paddingHorizontal: space.xs, borderRadius: radius.pill, backgroundColor: colors.danger, alignItems: 'center' },
});
