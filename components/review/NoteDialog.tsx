import { useEffect, useState } from 'react';
import { ApiError } from '../../lib/api';
import { AppText } from '../AppText';
import { Dialog, DialogActions } from '../Dialog';
import { ErrorBanner } from '../ErrorBanner';
import { TextField } from '../TextField';

interface NoteDialogProps {
  visible: boolean;
  title: string;
  message: string;
  fieldLabel: string;
  confirmLabel: string;
  /** Shown when the note is left empty. */
  requiredMessage: string;
  destructive?: boolean;
  busy: boolean;
  error: unknown;
  onConfirm: (note: string) => void;
  onCancel: () => void;
}

/** A decision that needs a written reason (send back, withdraw): what will happen, the reason, then the action. */
export function NoteDialog({ visible, title, message, fieldLabel, confirmLabel, requiredMessage, destructive, busy, error, onConfirm, onCancel }: NoteDialogProps) {
  const [note, setNote] = useState('');
  const [noteError, setNoteError] = useState<string>();
  useEffect(() => {
    if (!visible) {
      setNote('');
      setNoteError(undefined);
    }
  }, [visible]);
  const serverFieldError = error instanceof ApiError ? error.fieldIssues[0]?.message : undefined;
  return (
    <Dialog
      visible={visible}
      title={title}
      onClose={onCancel}
      actions={
        <DialogActions
          label={confirmLabel}
          variant={destructive ? 'danger' : 'primary'}
          onConfirm={() => (note.trim() ? onConfirm(note.trim()) : setNoteError(requiredMessage))}
          onCancel={onCancel}
          busy={busy}
        />
      }
    >
      <AppText>{message}</AppText>
      <TextField
        label={fieldLabel}
        value={note}
        onChangeText={(text) => {
          setNote(text);
          setNoteError(undefined);
        }}
        error={noteError ?? serverFieldError}
        multiline
        numberOfLines={3}
        maxLength={2000}
      />
      {error && !serverFieldError ? <ErrorBanner error={error} /> : null}
    </Dialog>
  );
}
