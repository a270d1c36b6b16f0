// A number with its unit and range: keeps what is typed, hands on a number only when it reads as one.
import { useEffect, useState } from 'react';
import { TextField } from '../TextField';
import type { NumberSpec } from './stepCatalogue';
import { fieldMessage } from './fieldMessage';
import { exampleOf } from './numberExample';
import { useReportUnreadable } from './unreadableFields';

interface NumberFieldProps {
  spec: NumberSpec;
  value: number | undefined;
  onChange: (value: number | undefined) => void;
  /** A problem reported for this field (by the shared schema or the server). */
  error?: string;
  /** Empty is allowed (an optional limit). */
  optional?: boolean;
  label?: string;
  /** The spoken name where the label repeats on the screen ("Gauge 2, lowest allowed (mm²)"). */
  accessibilityLabel?: string;
  /** Said before the label where the same field can be on screen more than once ("Step 2: Gaussian"). */
  context?: string;
}

function rangeHint(spec: NumberSpec): string {
  const parts: string[] = [];
  if (spec.min > -1e9 && spec.max < 1e9) parts.push(`${spec.min} to ${spec.max}`);
  if (spec.odd) parts.push('odd');
  else if (spec.integer) parts.push('whole number');
  if (spec.unit) parts.push(`in ${spec.unit}`);
  return parts.join(', ');
}

export function NumberField({ spec, value, onChange, error, optional = false, label, accessibilityLabel, context }: NumberFieldProps) {
  const [text, setText] = useState(value === undefined ? '' : String(value));
  const [typingError, setTypingError] = useState<string | undefined>();
  useReportUnreadable(typingError !== undefined);

  useEffect(() => {
    // Follow changes made elsewhere (a limit picked on the sweep, a duplicated step), not our own typing.
    setText((previous) => (Number(previous) === value && previous.trim() !== '' ? previous : value === undefined ? '' : String(value)));
  }, [value]);

  const change = (next: string) => {
    setText(next);
    const trimmed = next.trim().replace(',', '.');
    if (trimmed === '') {
      if (optional) {
        setTypingError(undefined);
        onChange(undefined);
      } else setTypingError('Enter a number');
      return;
    }
    const parsed = Number(trimmed);
    if (!Number.isFinite(parsed)) {
      setTypingError(`Enter a number, e.g. ${exampleOf(spec)}`);
      return;
    }
    setTypingError(undefined);
    onChange(parsed);
  };

  const name = label ?? spec.label;
  const shown = spec.unit && !name.includes(spec.unit) ? `${name} (${spec.unit})` : name;
  const spoken = accessibilityLabel ?? (context ? `${context}, ${shown}` : undefined);
  return (
    <TextField
      label={shown}
      hint={rangeHint(spec) || undefined}
      value={text}
      onChangeText={change}
      error={typingError ?? fieldMessage(error, name)}
      inputMode="decimal"
      autoCorrect={false}
      autoCapitalize="none"
      {...(spoken ? { accessibilityLabel: spoken } : {})}
    />
  );
}
