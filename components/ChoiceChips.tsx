import { Pressable, StyleSheet, View } from 'react-native';
import { colors, minTouchTarget, radius, space } from '../lib/theme';
import { AppText } from './AppText';

export interface Choice<T> {
  value: T;
  label: string;
  /** The spoken name when the label alone repeats across groups ("3" → "3 rows"). */
  accessibilityLabel?: string;
}

interface ChoiceChipsProps<T> {
  /** Names the group for screen readers and shows above the chips. */
  label: string;
  /** Said before the label where the same group can be on screen more than once ("Step 2: Gradient"). */
  context?: string;
  choices: readonly Choice<T>[];
  value: T;
  onChange: (value: T) => void;
}

/** Pick exactly one of a few values; the chosen chip is filled and ticked, not only coloured. */
export function ChoiceChips<T extends string | boolean | null>({ label, context, choices, value, onChange }: ChoiceChipsProps<T>) {
  return (
    <View style={styles.group}>
      <AppText variant="label" tone="muted">
        {label}
      </AppText>
      <View role="radiogroup" aria-label={context ? `${context}, ${label}` : label} style={styles.row}>
        {choices.map((choice) => {
          const selected = choice.value === value;
          return (
            <Pressable
              key={String(choice.value)}
              role="radio"
              aria-label={choice.accessibilityLabel ?? choice.label}
              aria-checked={selected}
              onPress={() => onChange(choice.value)}
              style={({ pressed }) => [styles.chip, selected && styles.chipSelected, pressed && !selected && styles.chipPressed]}
            >
              <AppText variant="label" tone={selected ? 'onSteel' : 'default'}>
                {selected ? `✓ ${choice.label}` : choice.label}
              </AppText>
            </Pressable>
          );
        })}
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  group: { gap: space.xs },
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  chip: {
    maxWidth: '100%',
    minHeight: minTouchTarget,
    justifyContent: 'center',
    paddingHorizontal: space.md,
    paddingVertical: space.xs,
    borderRadius: radius.pill,
    borderWidth: 1,
    borderColor: colors.control,
    backgroundColor: colors.surface,
  },
  chipSelected: { backgroundColor: colors.steel, borderColor: colors.steel },
  chipPressed: { backgroundColor: colors.steelTint },
});
