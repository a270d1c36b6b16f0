import { useEffect, useState } from 'react';
import { ApiError } from '../../lib/api';
import { fieldErrorsFrom, type FieldErrors } from '../../lib/formErrors';
import type { PartType } from '../../shared/api/catalogue';
import type { Line, Station } from '../../shared/api/stations';
import { ChoiceChips } from '../ChoiceChips';
import { Dialog, DialogActions } from '../Dialog';
import { ErrorBanner } from '../ErrorBanner';
import { TextField } from '../TextField';
import { PartTypeChecklist } from './PartTypeChecklist';

export interface StationFormValues {
  lineId: string;
  name: string;
  cameraNote: string;
  active: boolean;
  /** Codes of the part types inspected at the station. */
  partTypes: string[];
}

interface StationFormDialogProps {
  visible: boolean;
  /** Absent for a new station. */
  station?: Station;
  lines: Line[];
  /** The catalogue of part types to choose from. */
  partTypes: readonly PartType[];
  initialLineId?: string;
  busy: boolean;
  error: unknown;
  onSave: (values: StationFormValues) => void;
  onClose: () => void;
}

/** A new station on a line, or a station's name, camera note, part types and active flag. */
export function StationFormDialog({ visible, station, lines, partTypes, initialLineId, busy, error, onSave, onClose }: StationFormDialogProps) {
  const [values, setValues] = useState<StationFormValues>({ lineId: '', name: '', cameraNote: '', active: true, partTypes: [] });
  const [errors, setErrors] = useState<FieldErrors>({});
  useEffect(() => {
    if (visible) {
      setValues({ lineId: station?.lineId ?? initialLineId ?? lines[0]?.id ?? '', name: station?.name ?? '', cameraNote: station?.cameraNote ?? '', active: station?.active ?? true, partTypes: station?.partTypes ?? [] });
      setErrors({});
    }
  }, [visible, station, initialLineId, lines]);
  useEffect(() => {
    if (error instanceof ApiError && error.fieldIssues.length) setErrors(fieldErrorsFrom(error.fieldIssues));
  }, [error]);
  const save = () => {
    if (!values.name.trim()) return setErrors({ name: 'Enter a name' });
    onSave({ ...values, name: values.name.trim(), cameraNote: values.cameraNote.trim() });
  };
  return (
    <Dialog
      visible={visible}
      title={station ? `Edit ${station.name}` : 'New station'}
      onClose={onClose}
      actions={<DialogActions label={station ? 'Save changes' : 'Add station'} onConfirm={save} onCancel={onClose} busy={busy} />}
    >
      {station ? null : (
        <ChoiceChips label="Line" choices={lines.map((l) => ({ value: l.id, label: l.name }))} value={values.lineId} onChange={(lineId) => setValues((v) => ({ ...v, lineId }))} />
      )}
      <TextField label="Station name" value={values.name} onChangeText={(name) => setValues((v) => ({ ...v, name }))} error={errors.name} maxLength={80} />
      <TextField
        label="Camera note"
        hint="Camera, lens, light and photo size, so that a recalibration can reproduce the set-up."
        value={values.cameraNote}
        onChangeText={(cameraNote) => setValues((v) => ({ ...v, cameraNote }))}
        error={errors.cameraNote}
        multiline
        numberOfLines={2}
        maxLength={500}
      />
      <PartTypeChecklist partTypes={partTypes} value={values.partTypes} onChange={(codes) => setValues((v) => ({ ...v, partTypes: codes }))} error={errors.partTypes} />
      {station ? (
        <ChoiceChips
          label="In use"
          choices={[
            { value: true, label: 'Active: operators can choose it' },
            { value: false, label: 'Inactive' },
          ]}
          value={values.active}
          onChange={(active) => setValues((v) => ({ ...v, active }))}
        />
      ) : null}
      {error && !(error instanceof ApiError && error.fieldIssues.length) ? <ErrorBanner error={error} /> : null}
    </Dialog>
  );
}
