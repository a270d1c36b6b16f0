// A new reference set for one part type.
import { useState } from 'react';
import type { ReferenceSet } from '../../shared/api/references';
import { ApiError } from '../../lib/api';
import { fieldErrorsFrom, type FieldErrors } from '../../lib/formErrors';
import { useCreateReferenceSet } from '../../hooks/useReferenceSets';
import { Dialog, DialogActions } from '../Dialog';
import { ErrorBanner } from '../ErrorBanner';
import { PartTypeField } from '../PartTypeField';
import { TextField } from '../TextField';

export function CreateSetDialog({ onClose, onCreated }: { onClose: () => void; onCreated: (set: ReferenceSet) => void }) {
  const create = useCreateReferenceSet();
  const [name, setName] = useState('');
  const [partType, setPartType] = useState<string | null>(null);
  const [description, setDescription] = useState('');
  const [errors, setErrors] = useState<FieldErrors>({});
  const submit = () => {
    const local: FieldErrors = {};
    if (!name.trim()) local.name = 'Enter a name';
    if (!partType) local.partType = 'Choose the part type';
    setErrors(local);
    if (Object.keys(local).length > 0) return;
    create.mutate(
      { name: name.trim(), partType: partType!, description: description.trim() },
      { onSuccess: onCreated, onError: (error) => setErrors(error instanceof ApiError ? fieldErrorsFrom(error.fieldIssues) : {}) },
    );
  };
  return (
    <Dialog
      visible
      title="New reference set"
      onClose={onClose}
      actions={<DialogActions label="Create set" onConfirm={submit} onCancel={onClose} busy={create.isPending} />}
    >
      {create.error && Object.keys(errors).length === 0 ? <ErrorBanner error={create.error} /> : null}
      <TextField label="Set name" value={name} onChangeText={setName} error={errors.name} hint="E.g. “Washer rim, spring batch”." />
      <PartTypeField value={partType} onChange={setPartType} error={errors.partType} />
      <TextField label="Description (optional)" value={description} onChangeText={setDescription} error={errors.description} multiline />
    </Dialog>
  );
}
