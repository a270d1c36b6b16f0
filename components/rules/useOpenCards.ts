// Which of an editor's cards (steps, gauges) show their settings. Cards saved with the draft start
// closed, showing a one-line summary; a card added here starts open; a card with a problem is held
// open by its caller.
import { useState } from 'react';

export interface OpenCards {
  /** Whether the card shows its settings; `held` (a problem, a region being drawn) keeps it open. */
  isOpen: (key: string, held?: boolean) => boolean;
  setOpen: (key: string, open: boolean) => void;
  /** Opens or closes every card of `keys`. */
  setAll: (keys: readonly string[], open: boolean) => void;
}

export function useOpenCards(keys: readonly string[]): OpenCards {
  const [saved] = useState(() => new Set(keys));
  const [chosen, setChosen] = useState<Record<string, boolean>>({});
  return {
    isOpen: (key, held = false) => held || (chosen[key] ?? !saved.has(key)),
    setOpen: (key, open) => setChosen((c) => ({ ...c, [key]: open })),
    setAll: (all, open) => setChosen((c) => ({ ...c, ...Object.fromEntries(all.map((k) => [k, open])) })),
  };
}
