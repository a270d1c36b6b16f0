// A new rule: name, part type and the smallest defect it must catch; it starts from a simple pipeline.
import { useState } from 'react';
import { ApiError } from '../../lib/api';
import { fieldErrorsFrom, type FieldErrors } from '../../lib/formErrors';
import { useCreateRule } from '../../hooks/useRules';
import { createRuleRequestSchema, type RuleDetail } from '../../shared/api/rules';
import { AppText } from '../AppText';
import { Dialog, DialogActions } from '../Dialog';
import { ErrorBanner } from '../ErrorBanner';
import { PartTypeField } from '../PartTypeField';
import { TextField } from '../TextField';
import { startingDocument } from './ruleEditorState';

export function CreateRuleDialog({ onClose, onCreated }: { onClose: () => void; onCreated: (rule: RuleDetail) => void }) {
  const create = useCreateRule();
  const [name, setName] = useState('');
  const [partType, setPartType] = useState<string | null>(null);
  const [smallest, setSmallest] = useState('');
  const [errors, setErrors] = useState<FieldErrors>({});

  const submit = () => {
    const local: FieldErrors = {};
    if (!name.trim()) local.name = 'Enter a name';
    if (!partType) local.partType = 'Choose the part type';
    const mm = smallest.trim() === '' ? null : Number(smallest.replace(',', '.'));
    if (Number.isNaN(mm)) local.smallestDefectMm = 'Enter a size in mm, or leave it empty';
    else {
      // The server's own check, so that what passes here is not refused there.
      const size = createRuleRequestSchema.shape.smallestDefectMm.safeParse(mm);
      if (!size.success) local.smallestDefectMm = size.error.issues[0].message;
    }
    setErrors(local);
    if (Object.keys(local).length > 0) return;
    create.mutate(
      { name: name.trim(), partType: partType!, smallestDefectMm: mm, document: startingDocument(name.trim()) },
      { onSuccess: onCreated, onError: (error) => setErrors(error instanceof ApiError ? fieldErrorsFrom(error.fieldIssues) : {}) },
    );
  };

  return (
    <Dialog
      visible
      title="New rule"
      onClose={onClose}
      actions={<DialogActions label="Create rule" onConfirm={submit} onCancel={onClose} busy={create.isPending} />}
    >
      {create.error && Object.keys(errors).length === 0 ? <ErrorBanner error={create.error} /> : null}
      <TextField label="Rule name" value={name} onChangeText={setName} error={errors.name} hint="What it checks, e.g. “Washer rim burr”." />
      <PartTypeField value={partType} onChange={setPartType} error={errors.partType} />
      <TextField
        label="Smallest defect to catch (mm, optional)"
        hint="Used to check that a station’s camera can see it (at least 3 pixels across)."
        value={smallest}
        onChangeText={setSmallest}
        inputMode="decimal"
        error={errors.smallestDefectMm}
      />
      <AppText variant="caption" tone="muted">The rule starts as a draft with a simple pipeline: Gaussian smoothing, Sobel gradient magnitude, Otsu threshold and an opening, with one gauge. Change it in the editor.</AppText>
    </Dialog>
  );
}
