// Adds the matrix being edited to the kernel library as the engineer's own kernel.
import { useState } from 'react';
import { ApiError } from '../../lib/api';
import { fieldErrorsFrom, type FieldErrors } from '../../lib/formErrors';
import { useSaveKernel } from '../../hooks/useKernels';
import { Dialog, DialogActions } from '../Dialog';
import { ErrorBanner } from '../ErrorBanner';
import { TextField } from '../TextField';

interface SaveKernelDialogProps {
  matrix: number[][];
  divisor: number;
  offset: number;
  onClose: () => void;
  onSaved: (name: string) => void;
}

export function SaveKernelDialog({ matrix, divisor, offset, onClose, onSaved }: SaveKernelDialogProps) {
  const save = useSaveKernel();
  const [name, setName] = useState('');
  const [description, setDescription] = useState('');
  const [errors, setErrors] = useState<FieldErrors>({});
  const submit = () =>
    save.mutate(
      { name: name.trim().toLowerCase(), description, matrix, divisor, offset },
      {
        onSuccess: (kernel) => onSaved(kernel.name),
        onError: (error) => setErrors(error instanceof ApiError ? fieldErrorsFrom(error.fieldIssues) : {}),
      },
    );
  return (
    <Dialog
      visible
      title="Save as my kernel"
      onClose={onClose}
      actions={<DialogActions label="Save kernel" onConfirm={submit} onCancel={onClose} busy={save.isPending} />}
    >
      {save.error && Object.keys(errors).length === 0 ? <ErrorBanner error={save.error} /> : null}
      <TextField label="Kernel name" hint="Lower-case letters, digits and dashes, e.g. burr-emphasis-5x5." value={name} onChangeText={setName} error={errors.name} autoCapitalize="none" />
      <TextField label="What it is for" value={description} onChangeText={setDescription} error={errors.description} multiline />
    </Dialog>
  );
}
