// When the live preview runs after a change of the draft: at the next frame for a single change (a
// click, a drawn region, a value typed after a pause) when the engine's last run was quick and the
// draft validates; otherwise after the pause for typing, so that keystrokes in quick succession
// coalesce into one run, a slow engine does not hold up the next keystroke, and a half-typed value
// does not flash its error.

/** The pause for typing, in ms. */
export const PREVIEW_DEBOUNCE_MS = 150;
/** A run this quick (ms) lets the next single change run at once: the page stays responsive. */
export const QUICK_RUN_MS = 50;

export interface PauseInput {
  /** ms since the change before this one (Infinity for the first). */
  sinceLastChangeMs: number;
  /** The engine's time for the last run, ms (0 before the first). */
  lastRunMs: number;
  /** Whether the draft passes the rule format's validation. */
  valid: boolean;
}

/** The pause before the preview runs, in ms: 0 (the next frame) or PREVIEW_DEBOUNCE_MS. */
export function previewPauseMs({ sinceLastChangeMs, lastRunMs, valid }: PauseInput): number {
  const single = sinceLastChangeMs >= PREVIEW_DEBOUNCE_MS;
  return single && lastRunMs <= QUICK_RUN_MS && valid ? 0 : PREVIEW_DEBOUNCE_MS;
}
