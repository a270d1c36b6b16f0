// Labelling one photo or many at once: good, defective (with its defect kind) or retake.
import { useState } from 'react';
import type { ImageLabel } from '../../shared/api/references';
import { useDefectKinds, useRelabelImages } from '../../hooks/useReferenceSets';
import { AppText } from '../AppText';
import { ChoiceChips } from '../ChoiceChips';
import { Dialog, DialogActions } from '../Dialog';
import { ErrorBanner } from '../ErrorBanner';

interface LabelDialogProps {
  setId: string;
  imageIds: string[];
  /** The current label when one photo is labelled. */
  current?: { label: ImageLabel; defectKind: string | null };
  onClose: () => void;
  onDone: (count: number) => void;
}

export function LabelDialog({ setId, imageIds, current, onClose, onDone }: LabelDialogProps) {
  const relabel = useRelabelImages(setId);
  const defectKinds = useDefectKinds();
  const [label, setLabel] = useState<ImageLabel>(current?.label ?? 'good');
  const [defectKind, setDefectKind] = useState<string | null>(current?.defectKind ?? null);
  const save = () =>
    relabel.mutate(
      { imageIds, change: { label, defectKind: label === 'defective' ? defectKind : null } },
      { onSuccess: (items) => onDone(items.length) },
    );
  return (
    <Dialog
      visible
      title={imageIds.length === 1 ? 'Label this photo' : `Label ${imageIds.length} photos`}
      onClose={onClose}
      actions={<DialogActions label={imageIds.length === 1 ? 'Save label' : `Label ${imageIds.length} photos`} onConfirm={save} onCancel={onClose} busy={relabel.isPending} />}
    >
      <ChoiceChips
        label="Label"
        choices={[
          { value: 'good', label: 'Good' },
          { value: 'defective', label: 'Defective' },
          { value: 'retake', label: 'Retake (photo unusable)' },
          { value: 'unlabelled', label: 'Unlabelled' },
        ]}
        value={label}
        onChange={setLabel}
      />
      {label === 'defective' ? (
        defectKinds.data ? (
          <ChoiceChips label="Defect kind" choices={[{ value: null, label: 'Not stated' }, ...defectKinds.data.map((k) => ({ value: k.code, label: k.name }))]} value={defectKind} onChange={setDefectKind} />
        ) : (
          <AppText tone="muted">Loading defect kinds…</AppText>
        )
      ) : null}
      <AppText variant="caption" tone="muted">Labels are what trials judge a rule against: label only what you are sure of.</AppText>
      {relabel.error ? <ErrorBanner error={relabel.error} /> : null}
    </Dialog>
  );
}
