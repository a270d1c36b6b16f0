import { useEffect, useState } from 'react';
import { ApiError } from '../../lib/api';
import { AppText } from '../AppText';
import { Dialog, DialogActions } from '../Dialog';
import { ErrorBanner } from '../ErrorBanner';
import { TextField } from '../TextField';

interface LineDialogProps {
  visible: boolean;
  busy: boolean;
  error: unknown;
  onSave: (name: string) => void;
  onClose: () => void;
}

export function LineDialog({ visible, busy, error, onSave, onClose }: LineDialogProps) {
  const [name, setName] = useState('');
  const [nameError, setNameError] = useState<string>();
  useEffect(() => {
    if (visible) {
      setName('');
      setNameError(undefined);
    }
  }, [visible]);
  const serverIssue = error instanceof ApiError ? error.fieldIssues[0]?.message : undefined;
  return (
    <Dialog
      visible={visible}
      title="New line"
      onClose={onClose}
      actions={<DialogActions label="Add line" onConfirm={() => (name.trim() ? onSave(name.trim()) : setNameError('Enter a name'))} onCancel={onClose} busy={busy} />}
    >
      <AppText>A production line groups the stations that photograph its parts.</AppText>
      <TextField label="Line name" value={name} onChangeText={(text) => { setName(text); setNameError(undefined); }} error={nameError ?? serverIssue} maxLength={80} />
      {error && !serverIssue ? <ErrorBanner error={error} /> : null}
    </Dialog>
  );
}
