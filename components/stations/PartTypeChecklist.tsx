import { Pressable, StyleSheet, View } from 'react-native';
import { colors, minTouchTarget, radius, space } from '../../lib/theme';
import type { PartType } from '../../shared/api/catalogue';
import { AppText } from '../AppText';

interface PartTypeChecklistProps {
  partTypes: readonly PartType[];
  /** Codes of the ticked part types. */
  value: readonly string[];
  onChange: (codes: string[]) => void;
  error?: string;
}

/** Tick the part types a station inspects; its operators are offered only their released rules. */
export function PartTypeChecklist({ partTypes, value, onChange, error }: PartTypeChecklistProps) {
  // Kept in catalogue order, so the list sent matches what the person sees.
  const toggle = (code: string) =>
    onChange(value.includes(code) ? value.filter((held) => held !== code) : partTypes.map((p) => p.code).filter((c) => c === code || value.includes(c)));
  return (
    <View style={styles.group}>
      <AppText variant="label">Part types inspected here</AppText>
      <AppText variant="caption" tone="muted">
        Operators at this station are offered only the released rules for these part types. With none ticked, every released rule is offered.
      </AppText>
      <View role="group" aria-label="Part types inspected here" style={styles.list}>
        {partTypes.map((partType) => {
          const checked = value.includes(partType.code);
          return (
            <Pressable
              key={partType.code}
              role="checkbox"
              aria-label={`${partType.name}, ${partType.code}`}
              aria-checked={checked}
              onPress={() => toggle(partType.code)}
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
                <AppText variant="bodyStrong">{partType.name}</AppText>
                <AppText variant="caption" tone="muted">{`${partType.code} · ${partType.family}`}</AppText>
              </View>
            </Pressable>
          );
        })}
      </View>
      {error ? (
        <AppText variant="caption" tone="danger" accessibilityRole="alert">
          {`⚠ ${error}`}
        </AppText>
      ) : null}
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
