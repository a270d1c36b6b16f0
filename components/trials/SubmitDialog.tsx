// Submitting a draft for review: the note for the reviewer, and why the server may refuse.
import { useState } from 'react';
import { useSubmitForReview } from '../../hooks/useRules';
import { AppText } from '../AppText';
import { Dialog, DialogActions } from '../Dialog';
import { ErrorBanner } from '../ErrorBanner';
import { TextField } from '../TextField';

interface SubmitDialogProps {
  versionId: string;
  versionNumber: number;
  /** A reason known beforehand why the server will refuse, or null. */
  foreseenRefusal: string | null;
  /** What the latest trial says against the rule (trialCautions): the note must answer it. */
  cautions: string[];
  onClose: () => void;
  onSubmitted: () => void;
}

export function SubmitDialog({ versionId, versionNumber, foreseenRefusal, cautions, onClose, onSubmitted }: SubmitDialogProps) {
  const submit = useSubmitForReview();
  const [note, setNote] = useState('');
  const [noteError, setNoteError] = useState<string>();
  const send = () => {
    if (cautions.length > 0 && !note.trim()) {
      setNoteError('Say in the note why the rule can go to review with these trial results.');
      return;
    }
    submit.mutate({ versionId, note }, { onSuccess: onSubmitted });
  };
  return (
    <Dialog
      visible
      title={`Submit version ${versionNumber} for review?`}
      onClose={onClose}
      actions={<DialogActions label="Submit for review" onConfirm={send} onCancel={onClose} busy={submit.isPending} />}
    >
      <AppText>
        A supervisor will review the rule with its latest trial attached, then release it or send it back. From now on the version cannot be edited; a change needs a new draft.
      </AppText>
      {foreseenRefusal ? <AppText tone="caution">{`⚠ ${foreseenRefusal}`}</AppText> : null}
      {cautions.map((caution) => (
        <AppText key={caution} tone="danger" variant="bodyStrong">{`⚠ ${caution}`}</AppText>
      ))}
      <TextField
        label={cautions.length > 0 ? 'Note for the reviewer (required)' : 'Note for the reviewer'}
        hint={cautions.length > 0 ? 'Why the rule can go to review with these results, and what the plant’s procedure asks.' : 'What changed and why, and what the trial shows.'}
        value={note}
        onChangeText={(text) => {
          setNote(text);
          setNoteError(undefined);
        }}
        error={noteError}
        multiline
      />
      {submit.error ? (
        <ErrorBanner
          error={submit.error}
          nextStep="A draft goes to review only with a finished trial of exactly its current content: save the draft, run the trial again, then submit."
        />
      ) : null}
    </Dialog>
  );
}
