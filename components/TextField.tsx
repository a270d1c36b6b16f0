import { forwardRef, useState } from 'react';
import { StyleSheet, TextInput, View, type TextInputProps } from 'react-native';
import { colors, minTouchTarget, radius, space, type as typeScale } from '../lib/theme';
import { AppText } from './AppText';
import { FieldError } from './FieldError';

interface TextFieldProps extends Omit<TextInputProps, 'style'> {
  label: string;
  /** Shown under the field and announced with it; the border turns red too, never the only sign. */
  error?: string;
  hint?: string;
}

export const TextField = forwardRef<TextInput, TextFieldProps>(function TextField(
  { label, error, hint, onFocus, onBlur, ...inputProps },
  ref,
) {
  const [focused, setFocused] = useState(false);
  const description = [error, hint].filter(Boolean).join('. ');
  return (
    <View style={styles.field}>
      <AppText variant="label">{label}</AppText>
      {hint ? (
        <AppText variant="caption" tone="muted">
          {hint}
        </AppText>
      ) : null}
      <TextInput
        ref={ref}
        accessibilityLabel={label}
        accessibilityHint={description || undefined}
        aria-invalid={error ? true : undefined}
        placeholderTextColor={colors.inkMuted}
        onFocus={(event) => {
          setFocused(true);
          onFocus?.(event);
        }}
        onBlur={(event) => {
          setFocused(false);
          onBlur?.(event);
        }}
        style={[styles.input, focused && styles.inputFocused, error ? styles.inputInvalid : null]}
        {...inputProps}
      />
      <FieldError error={error} />
    </View>
  );
});

const styles = StyleSheet.create({
  field: { gap: space.xs },
  input: {
    ...typeScale.body,
    color: colors.ink,
    minHeight: minTouchTarget,
    paddingHorizontal: space.md,
    paddingVertical: space.sm,
    borderWidth: 1,
    borderColor: colors.control,
    borderRadius: radius.md,
    backgroundColor: colors.surface,
  },
  inputFocused: { borderColor: colors.focus, borderWidth: 2, paddingHorizontal: space.md - 1 },
  inputInvalid: { borderColor: colors.danger, borderWidth: 2, paddingHorizontal: space.md - 1 },
});
