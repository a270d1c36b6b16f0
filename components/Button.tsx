import { ActivityIndicator, Pressable, StyleSheet, View, type StyleProp, type ViewStyle } from 'react-native';
import { colors, minTouchTarget, radius, space } from '../lib/theme';
import { AppText } from './AppText';

export type ButtonVariant = 'primary' | 'secondary' | 'danger' | 'quiet';

interface ButtonProps {
  label: string;
  onPress: () => void;
  variant?: ButtonVariant;
  /** Shown while the action runs; the button is disabled meanwhile. */
  busy?: boolean;
  disabled?: boolean;
  /** Longer description for screen readers when the label alone is ambiguous ("Edit" -> "Edit Ada Lind"). */
  accessibilityLabel?: string;
  accessibilityHint?: string;
  compact?: boolean;
  /** For a button that shows and hides a part of the screen: whether that part is shown now. */
  expanded?: boolean;
  style?: StyleProp<ViewStyle>;
  testID?: string;
}

const LOOKS: Record<ButtonVariant, { background: string; pressed: string; border: string; text: 'onSteel' | 'steel' | 'danger' }> = {
  primary: { background: colors.steel, pressed: colors.steelPressed, border: colors.steel, text: 'onSteel' },
  secondary: { background: colors.surface, pressed: colors.steelTint, border: colors.control, text: 'steel' },
  danger: { background: colors.danger, pressed: colors.dangerPressed, border: colors.danger, text: 'onSteel' },
  quiet: { background: 'transparent', pressed: colors.steelTint, border: 'transparent', text: 'steel' },
};

export function Button({
  label,
  onPress,
  variant = 'primary',
  busy = false,
  disabled = false,
  accessibilityLabel,
  accessibilityHint,
  compact = false,
  expanded,
  style,
  testID,
}: ButtonProps) {
  const look = LOOKS[variant];
  const inactive = disabled || busy;
  return (
    <Pressable
      accessibilityRole="button"
      accessibilityLabel={accessibilityLabel ?? label}
      accessibilityHint={accessibilityHint}
      accessibilityState={{ disabled: inactive, busy, expanded }}
      aria-expanded={expanded}
      disabled={inactive}
      onPress={onPress}
      testID={testID}
      style={({ pressed }) => [
        styles.base,
        compact && styles.compact,
        { backgroundColor: pressed ? look.pressed : look.background, borderColor: look.border },
        inactive && styles.inactive,
        style,
      ]}
    >
      <View style={styles.content}>
        {busy ? <ActivityIndicator size="small" color={variant === 'primary' || variant === 'danger' ? colors.onSteel : colors.steel} /> : null}
        <AppText variant="label" tone={look.text} numberOfLines={1}>
          {label}
        </AppText>
      </View>
    </Pressable>
  );
}

const styles = StyleSheet.create({
  base: {
    minHeight: minTouchTarget,
    minWidth: minTouchTarget,
    paddingHorizontal: space.lg,
    borderRadius: radius.md,
    borderWidth: 1,
    alignItems: 'center',
    justifyContent: 'center',
  },
  compact: { paddingHorizontal: space.md },
  content: { flexDirection: 'row', alignItems: 'center', gap: space.sm },
  inactive: { opacity: 0.55 },
});
