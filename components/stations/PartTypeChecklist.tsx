import type { PartType } from '../../shared/api/catalogue';
import { CheckList } from '../CheckList';

interface PartTypeChecklistProps {
  partTypes: readonly PartType[];
  /** Codes of the ticked part types. */
  value: readonly string[];
  onChange: (codes: string[]) => void;
  error?: string;
}

/** Tick the part types a station inspects; its operators are offered only their released rules. */
export function PartTypeChecklist({ partTypes, value, onChange, error }: PartTypeChecklistProps) {
  // Kept in catalogue order, so the list sent matches what the person sees.
  const items = partTypes.map((p) => ({ value: p.code, label: p.name, detail: `${p.code} · ${p.family}`, accessibilityLabel: `${p.name}, ${p.code}` }));
  return (
    <CheckList
      label="Part types inspected here"
      description="Operators at this station are offered only the released rules for these part types. With none ticked, every released rule is offered."
      items={items}
      value={value}
      onChange={onChange}
      error={error}
    />
  );
}
