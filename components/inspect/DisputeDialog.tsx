import { useState } from 'react';
import { ApiError } from '../../lib/api';
import { useDisputeInspection } from '../../hooks/useInspections';
import type { Inspection } from '../../shared/api/inspections';
import { AppText } from '../AppText';
import { Dialog, DialogActions } from '../Dialog';
import { ErrorBanner } from '../ErrorBanner';
import { TextField } from '../TextField';

interface DisputeDialogProps {
  inspection: Inspection;
  visible: boolean;
  onClose: () => void;
  onDisputed: (inspection: Inspection) => void;
}

/** The operator says why a verdict looks wrong; a qualified person then judges the part. */
export function DisputeDialog({ inspection, visible, onClose, onDisputed }: DisputeDialogProps) {
  const [note, setNote] = useState('');
  const [noteError, setNoteError] = useState<string>();
  const dispute = useDisputeInspection();
  const submit = () => {
    if (!note.trim()) {
      setNoteError('Say why the verdict looks wrong');
      return;
    }
    dispute.mutate(
      { id: inspection.id, note: note.trim() },
      {
        onSuccess: (updated) => {
          setNote('');
          onDisputed(updated);
        },
        onError: (error) => {
          if (error instanceof ApiError && error.fieldIssues[0]) setNoteError(error.fieldIssues[0].message);
        },
      },
    );
  };
  return (
    <Dialog
      visible={visible}
      title={`Dispute the ${inspection.verdict} verdict`}
      onClose={onClose}
      actions={<DialogActions label="Send dispute" onConfirm={submit} onCancel={onClose} busy={dispute.isPending} />}
    >
      <AppText>
        Keep the part aside. A supervisor or another qualified person will look at the part itself and record their judgement; the verdict
        stays in the record as it was given.
      </AppText>
      <TextField
        label="Why does the verdict look wrong?"
        value={note}
        onChangeText={(text) => {
          setNote(text);
          setNoteError(undefined);
        }}
        error={noteError}
        multiline
        numberOfLines={3}
        maxLength={2000}
      />
      {dispute.error && !(dispute.error instanceof ApiError && dispute.error.fieldIssues.length) ? <ErrorBanner error={dispute.error} /> : null}
    </Dialog>
  );
}
