// The browser's back and forward buttons while a page holds unsaved work (lib/leaveGuard.ts). The
// browser has already moved when popstate arrives, so the router must not see the event, and the
// page's history entry is put back: one step forward for a back button; for a forward button two
// steps back, or one when there was no entry further on (no event then). Once back, the person is
// asked; agreeing makes the same move again with the guard lifted, and the router follows it.
// The listener is installed when the app loads (app/_layout.tsx), before the router's own: a
// capture listener added later on window still ran after the router's in Chromium.
import { leaveGuardState, requestLeave } from './leaveGuard';

type Restoring = 'no' | 'forward' | 'backward';

/** The router's id of a history entry: expo-router keeps `{ id }` in history.state. */
function entryId(): unknown {
  return (window.history.state as { id?: unknown } | null)?.id;
}

let guarded: { entry: unknown } | null = null;
let restoring: Restoring = 'no';
let noEntryFurther: ReturnType<typeof setTimeout> | undefined;
let installed = false;

function putBack(steps: number): void {
  restoring = steps > 0 ? 'forward' : 'backward';
  window.history.go(steps);
}

function onPopState(event: PopStateEvent): void {
  if (!guarded || leaveGuardState().reason === null) {
    restoring = 'no';
    return;
  }
  event.stopImmediatePropagation();
  clearTimeout(noEntryFurther);
  if (restoring === 'no') {
    putBack(1);
    // A step forward answers within milliseconds; no answer means there was no entry further on.
    noEntryFurther = setTimeout(() => putBack(-1), 1000);
  } else if (entryId() === guarded.entry) {
    const move = restoring === 'forward' ? -1 : 1;
    restoring = 'no';
    requestLeave(() => window.history.go(move));
  } else if (restoring === 'forward') {
    putBack(-2);
  } else {
    // Neither way led back to the page's entry: the page stays, still guarded.
    restoring = 'no';
  }
}

/** Once, on the web, when the app loads. */
export function installHistoryGuard(): void {
  if (installed || typeof window === 'undefined' || typeof window.addEventListener !== 'function') return;
  installed = true;
  window.addEventListener('popstate', onPopState, true);
}

/** Holds the browser's back and forward on the current history entry (true), or lets them go (false). */
export function holdHistory(hold: boolean): void {
  clearTimeout(noEntryFurther);
  restoring = 'no';
  guarded = hold && typeof window !== 'undefined' && window.history ? { entry: entryId() } : null;
}
