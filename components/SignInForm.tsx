import { useRef, useState } from 'react';
import { StyleSheet, View, type TextInput } from 'react-native';
import { signInRequestSchema } from '../shared/api/auth';
import { ApiError } from '../lib/api';
import { fieldErrorsFrom, validateForm, type FieldErrors } from '../lib/formErrors';
import { calloutStyle, space } from '../lib/theme';
import type { SessionEndReason } from '../lib/session';
import { useSignIn } from '../hooks/useSession';
import { AppText } from './AppText';
import { Button } from './Button';
import { ErrorBanner } from './ErrorBanner';
import { TextField } from './TextField';

const REFUSED = {
  message: 'That user name and password do not match an active account.',
  nextStep: 'Check both and try again. If your account was deactivated, ask your administrator.',
};

export function SignInForm({ endReason }: { endReason: SessionEndReason | null }) {
  const signIn = useSignIn();
  const passwordField = useRef<TextInput>(null);
  const [username, setUsername] = useState('');
  const [password, setPassword] = useState('');
  const [fieldErrors, setFieldErrors] = useState<FieldErrors>({});

  const edit = (field: 'username' | 'password', setValue: (value: string) => void) => (value: string) => {
    setValue(value);
    setFieldErrors((errors) => ({ ...errors, [field]: undefined }));
  };

  const submit = () => {
    if (signIn.isPending) return;
    signIn.reset();
    const checked = validateForm(signInRequestSchema, { username, password });
    if (!checked.ok) {
      setFieldErrors(checked.errors);
      return;
    }
    setFieldErrors({});
    signIn.mutate(checked.data, {
      onError: (error) => {
        if (error instanceof ApiError && error.fieldIssues.length > 0) setFieldErrors(fieldErrorsFrom(error.fieldIssues));
      },
    });
  };

  const error = signIn.error;
  const refused = error instanceof ApiError && error.code === 'unauthenticated';
  const hasFieldIssues = error instanceof ApiError && error.fieldIssues.length > 0;

  return (
    <View style={styles.form}>
      {endReason === 'expired' && !error ? (
        <View accessibilityRole="alert" style={styles.notice}>
          <AppText variant="bodyStrong">Your session has ended.</AppText>
          <AppText>Sign in again to carry on where you were.</AppText>
        </View>
      ) : null}
      {error && !hasFieldIssues ? (
        <ErrorBanner error={error} message={refused ? REFUSED.message : undefined} nextStep={refused ? REFUSED.nextStep : undefined} />
      ) : null}
      <TextField
        label="User name"
        value={username}
        onChangeText={edit('username', setUsername)}
        error={fieldErrors.username}
        autoCapitalize="none"
        autoCorrect={false}
        autoComplete="username"
        textContentType="username"
        autoFocus
        returnKeyType="next"
        onSubmitEditing={() => (password ? submit() : passwordField.current?.focus())}
        testID="sign-in-username"
      />
      <TextField
        ref={passwordField}
        label="Password"
        value={password}
        onChangeText={edit('password', setPassword)}
        error={fieldErrors.password}
        secureTextEntry
        autoCapitalize="none"
        autoComplete="current-password"
        textContentType="password"
        returnKeyType="go"
        onSubmitEditing={submit}
        testID="sign-in-password"
      />
      <Button label="Sign in" onPress={submit} busy={signIn.isPending} testID="sign-in-submit" />
    </View>
  );
}

const styles = StyleSheet.create({
  form: { gap: space.lg },
  notice: {
    gap: space.xxs,
    ...calloutStyle('steel'),
  },
});
