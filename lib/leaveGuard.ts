// Whether leaving the current page would lose work (a draft with unsaved changes), so that every way
// out of it asks first. The page holding the work sets the reason (hooks/useLeaveGuard.ts); the
// navigation calls requestLeave with what it was about to do, and the shell's dialog
// (components/LeaveGuardDialog.tsx) lets the person go on or stay.

export interface LeaveGuardState {
  /** What would be lost, in the person's words; null when nothing would be. */
  reason: string | null;
  /** True while a navigation waits for the person's answer. */
  asking: boolean;
}

type Listener = () => void;

let state: LeaveGuardState = { reason: null, asking: false };
let pending: (() => void) | null = null;
const listeners = new Set<Listener>();

function update(next: LeaveGuardState): void {
  state = next;
  for (const listener of listeners) listener();
}

export function subscribeLeaveGuard(listener: Listener): () => void {
  listeners.add(listener);
  return () => {
    listeners.delete(listener);
  };
}

export function leaveGuardState(): LeaveGuardState {
  return state;
}

/** Sets (or with null clears) what leaving would lose; clearing also drops a question left open. */
export function setLeaveGuard(reason: string | null): void {
  if (reason === null) pending = null;
  if (reason === state.reason && (reason !== null || !state.asking)) return;
  update({ reason, asking: reason !== null && pending !== null });
}

/** Runs `proceed` now when nothing would be lost, else once the person agrees (confirmLeave). */
export function requestLeave(proceed: () => void): void {
  if (state.reason === null) {
    proceed();
    return;
  }
  pending = proceed;
  update({ ...state, asking: true });
}

/** The person agreed to lose the work: the guard is lifted and the waiting navigation goes on. */
export function confirmLeave(): void {
  const proceed = pending;
  pending = null;
  update({ reason: null, asking: false });
  proceed?.();
}

/** The person chose to stay: the waiting navigation is dropped and the guard kept. */
export function cancelLeave(): void {
  pending = null;
  update({ ...state, asking: false });
}

/**
 * For a Link's onPress: when leaving would lose work, stops the link and asks first, then goes on
 * with `go` (the link's own navigation, done again once the person agrees).
 */
export function guardLinkPress(event: { preventDefault(): void } | undefined, go: () => void): void {
  if (state.reason === null) return;
  event?.preventDefault();
  requestLeave(go);
}
