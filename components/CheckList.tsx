import { Pressable, StyleSheet, View } from 'react-native';
import { colors, minTouchTarget, radius, space } from '../lib/theme';
import { AppText } from './AppText';
import { FieldError } from './FieldError';

export interface CheckListItem<T extends string> {
  value: T;
  label: string;
  /** A second, smaller line under the label. */
  detail: string;
  /** What a screen reader announces instead of the label. */
  accessibilityLabel?: string;
  accessibilityHint?: string;
}

interface CheckListProps<T extends string> {
  /** Shown above the boxes and names the group for screen readers. */
  label: string;
  description?: string;
  items: readonly CheckListItem<T>[];
  value: readonly T[];
  /** The ticked values, always in the items' order. */
  onChange: (value: T[]) => void;
  error?: string;
}

/** Tick any number of items: a box with a tick (not colour alone), the label and a detail line. */
export function CheckList<T extends string>({ label, description, items, value, onChange, error }: CheckListProps<T>) {
  const toggle = (item: T) =>
    onChange(value.includes(item) ? value.filter((held) => held !== item) : items.map((i) => i.value).filter((v) => v === item || value.includes(v)));
  return (
    <View style={styles.group}>
      <AppText variant="label">{label}</AppText>
      {description ? (
        <AppText variant="caption" tone="muted">
          {description}
        </AppText>
      ) : null}
      <View role="group" aria-label={label} style={styles.list}>
        {items.map((item) => {
          const checked = value.includes(item.value);
          return (
            <Pressable
              key={item.value}
              role="checkbox"
              aria-label={item.accessibilityLabel ?? item.label}
              aria-checked={checked}
              accessibilityHint={item.accessibilityHint}
              onPress={() => toggle(item.value)}
              style={({ pressed }) => [styles.option, pressed && styles.optionPressed]}
            >
              <View style={[styles.box, checked && styles.boxChecked]}>
                {checked ? (
                  <AppText variant="label" tone="onSteel" style={styles.tick}>
                    ✓
                  </AppText>
                ) : null}
              </View>
              <View style={styles.optionText}>
                <AppText variant="bodyStrong">{item.label}</AppText>
                <AppText variant="caption" tone="muted">
                  {item.detail}
                </AppText>
              </View>
            </Pressable>
          );
        })}
      </View>
      <FieldError error={error} />
    </View>
  );
}

const styles = StyleSheet.create({
  group: { gap: space.xs },
  list: { gap: space.xxs },
  option: {
    minHeight: minTouchTarget,
    flexDirection: 'row',
    alignItems: 'center',
    gap: space.md,
    paddingVertical: space.xs,
    paddingHorizontal: space.sm,
    borderRadius: radius.md,
  },
  optionPressed: { backgroundColor: colors.steelTint },
  box: {
    width: 24,
    height: 24,
    borderRadius: radius.sm,
    borderWidth: 2,
    borderColor: colors.control,
    alignItems: 'center',
    justifyContent: 'center',
    backgroundColor: colors.surface,
  },
  boxChecked: { backgroundColor: colors.steel, borderColor: colors.steel },
  tick: { lineHeight: 18 },
  optionText: { flexShrink: 1 },
});
