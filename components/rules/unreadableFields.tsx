// Fields whose text does not read as a number ("abc", an emptied required field): the draft's editor
// counts them, so that it neither says "saved" nor saves the last number such a field held.
import { createContext, useCallback, useContext, useEffect, useId, useMemo, useState } from 'react';

interface UnreadableFields {
  report: (id: string, unreadable: boolean) => void;
}

export const UnreadableFieldsContext = createContext<UnreadableFields | null>(null);

/** The editor's side: how many fields on screen hold unreadable text, and the value to provide. */
export function useUnreadableFieldCount(): { count: number; fields: UnreadableFields } {
  const [ids, setIds] = useState<ReadonlySet<string>>(() => new Set());
  const report = useCallback((id: string, unreadable: boolean) => {
    setIds((held) => {
      if (held.has(id) === unreadable) return held;
      const next = new Set(held);
      if (unreadable) next.add(id);
      else next.delete(id);
      return next;
    });
  }, []);
  const fields = useMemo(() => ({ report }), [report]);
  return { count: ids.size, fields };
}

/** A field's side: says whether its text is unreadable while it is on screen (outside an editor, nothing). */
export function useReportUnreadable(unreadable: boolean): void {
  const fields = useContext(UnreadableFieldsContext);
  const id = useId();
  useEffect(() => {
    fields?.report(id, unreadable);
  }, [fields, id, unreadable]);
  useEffect(() => () => fields?.report(id, false), [fields, id]);
}
