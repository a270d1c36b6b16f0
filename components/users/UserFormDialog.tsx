// Add a user, or change one's name, e-mail, roles or password.
import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import type { User } from '../../shared/api/auth';
import type { Role } from '../../shared/roles';
import { createUserRequestSchema, updateUserRequestSchema, type UpdateUserRequest } from '../../shared/api/users';
import { ApiError } from '../../lib/api';
import { fieldErrorsFrom, validateForm, type FieldErrors } from '../../lib/formErrors';
import { calloutStyle, space } from '../../lib/theme';
import { useCreateUser, useUpdateUser } from '../../hooks/useUsers';
import { AppText } from '../AppText';
import { Dialog, DialogActions } from '../Dialog';
import { ErrorBanner } from '../ErrorBanner';
import { RolePicker } from '../RolePicker';
import { TextField } from '../TextField';

interface UserFormDialogProps {
  /** The user to edit; absent to add a new one. */
  user?: User;
  currentUserId: string;
  onClose: () => void;
  onSaved: (user: User, created: boolean) => void;
}

interface FormValues {
  username: string;
  displayName: string;
  email: string;
  password: string;
  roles: Role[];
}

function initialValues(user?: User): FormValues {
  return {
    username: user?.username ?? '',
    displayName: user?.displayName ?? '',
    email: user?.email ?? '',
    password: '',
    roles: user ? [...user.roles] : [],
  };
}

/** Only what changed is sent, so the audit trail records what the administrator actually did. */
function changesFrom(user: User, values: FormValues): UpdateUserRequest {
  const changes: UpdateUserRequest = {};
  const email = values.email.trim() || null;
  if (values.displayName.trim() !== user.displayName) changes.displayName = values.displayName;
  if (email !== user.email) changes.email = email;
  if ([...values.roles].sort().join() !== [...user.roles].sort().join()) changes.roles = values.roles;
  if (values.password) changes.password = values.password;
  return changes;
}

/** The server's refusal, placed beside the field it concerns when it concerns one. */
function fieldErrorsOf(error: unknown): FieldErrors {
  if (!(error instanceof ApiError)) return {};
  if (error.fieldIssues.length > 0) return fieldErrorsFrom(error.fieldIssues);
  if (error.code === 'conflict') return { username: error.message };
  return {};
}

export function UserFormDialog({ user, currentUserId, onClose, onSaved }: UserFormDialogProps) {
  const editing = user !== undefined;
  const createUser = useCreateUser();
  const updateUser = useUpdateUser();
  const mutation = editing ? updateUser : createUser;
  const [values, setValues] = useState<FormValues>(() => initialValues(user));
  const [fieldErrors, setFieldErrors] = useState<FieldErrors>({});
  const [requestError, setRequestError] = useState<unknown>(null);

  const set = <K extends keyof FormValues>(key: K) => (value: FormValues[K]) => {
    setValues((previous) => ({ ...previous, [key]: value }));
    setFieldErrors((errors) => ({ ...errors, [key]: undefined }));
  };

  const fail = (error: unknown) => {
    const errors = fieldErrorsOf(error);
    setFieldErrors(errors);
    setRequestError(Object.keys(errors).length > 0 ? null : error);
  };

  const save = () => {
    setRequestError(null);
    if (editing) {
      const changes = changesFrom(user, values);
      if (Object.keys(changes).length === 0) return onClose();
      const checked = validateForm(updateUserRequestSchema, changes);
      if (!checked.ok) return setFieldErrors(checked.errors);
      setFieldErrors({});
      updateUser.mutate({ id: user.id, changes }, { onSuccess: (saved) => onSaved(saved, false), onError: fail });
      return;
    }
    const body = { ...values, email: values.email.trim() || null };
    const checked = validateForm(createUserRequestSchema, body);
    if (!checked.ok) return setFieldErrors(checked.errors);
    setFieldErrors({});
    createUser.mutate(body, { onSuccess: (saved) => onSaved(saved, true), onError: fail });
  };

  const losingOwnAdminRole = editing && user.id === currentUserId && user.roles.includes('admin') && !values.roles.includes('admin');

  return (
    <Dialog
      visible
      title={editing ? `Edit ${user.displayName}` : 'Add a user'}
      onClose={onClose}
      actions={<DialogActions label={editing ? 'Save changes' : 'Add user'} onConfirm={save} onCancel={onClose} busy={mutation.isPending} />}
    >
      {requestError ? <ErrorBanner error={requestError} /> : null}
      {editing ? (
        <AppText tone="muted">{`User name: ${user.username} (cannot be changed)`}</AppText>
      ) : (
        <TextField
          label="User name"
          hint="What the person types to sign in: letters, digits, dots, dashes or underscores."
          value={values.username}
          onChangeText={set('username')}
          error={fieldErrors.username}
          autoCapitalize="none"
          autoCorrect={false}
          autoComplete="off"
        />
      )}
      <TextField label="Full name" value={values.displayName} onChangeText={set('displayName')} error={fieldErrors.displayName} autoComplete="off" />
      <TextField
        label="E-mail (optional)"
        hint="Used for alerts."
        value={values.email}
        onChangeText={set('email')}
        error={fieldErrors.email}
        autoCapitalize="none"
        autoCorrect={false}
        inputMode="email"
        autoComplete="off"
      />
      <TextField
        label={editing ? 'New password (optional)' : 'First password'}
        hint={editing ? 'Leave empty to keep the current password. At least 10 characters.' : 'At least 10 characters. Hand it to the person privately.'}
        value={values.password}
        onChangeText={set('password')}
        error={fieldErrors.password}
        secureTextEntry
        autoComplete="new-password"
      />
      <RolePicker value={values.roles} onChange={set('roles')} error={fieldErrors.roles} />
      {losingOwnAdminRole ? (
        <View style={styles.warning} accessibilityRole="alert">
          <AppText variant="label" tone="caution">
            You are removing your own Administrator role
          </AppText>
          <AppText>Once saved, you can no longer manage users. Another administrator would have to give it back.</AppText>
        </View>
      ) : null}
      {fieldErrors['(root)'] ? (
        <AppText tone="danger" accessibilityRole="alert">{`⚠ ${fieldErrors['(root)']}`}</AppText>
      ) : null}
    </Dialog>
  );
}

const styles = StyleSheet.create({
  warning: {
    gap: space.xxs,
    ...calloutStyle('caution'),
  },
});
