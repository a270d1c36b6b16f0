// The signed-in session: held in memory, mirrored to localStorage on the web so a reload keeps
// the person signed in until the token expires. Components read it through hooks/useSession.
import { signInResponseSchema, type SignInResponse, type User } from '../shared/api/auth';

export type Session = SignInResponse;
/** Why the last session ended; the sign-in screen explains an expired one. */
export type SessionEndReason = 'signed-out' | 'expired';

export interface SessionSnapshot {
  session: Session | null;
  endReason: SessionEndReason | null;
}

const STORAGE_KEY = 'kernwright.session';

type Listener = () => void;
const listeners = new Set<Listener>();
let snapshot: SessionSnapshot | null = null;

function browserStorage(): Storage | null {
  try {
    return typeof window !== 'undefined' && window.localStorage ? window.localStorage : null;
  } catch {
    // Storage can be blocked (private mode, strict settings): the session then lasts for the page only.
    return null;
  }
}

function isExpired(session: Session, now: number): boolean {
  const expiresAt = Date.parse(session.expiresAt);
  return Number.isNaN(expiresAt) || expiresAt <= now;
}

function readStoredSession(): Session | null {
  const storage = browserStorage();
  const raw = storage?.getItem(STORAGE_KEY);
  if (!raw) return null;
  try {
    const parsed = signInResponseSchema.safeParse(JSON.parse(raw));
    if (parsed.success && !isExpired(parsed.data, Date.now())) return parsed.data;
  } catch {
    // A damaged entry is treated as no session.
  }
  storage?.removeItem(STORAGE_KEY);
  return null;
}

function writeStoredSession(session: Session | null): void {
  const storage = browserStorage();
  if (!storage) return;
  if (session) storage.setItem(STORAGE_KEY, JSON.stringify(session));
  else storage.removeItem(STORAGE_KEY);
}

function publish(next: SessionSnapshot): void {
  snapshot = next;
  listeners.forEach((listener) => listener());
}

export function getSessionSnapshot(): SessionSnapshot {
  if (!snapshot) snapshot = { session: readStoredSession(), endReason: null };
  return snapshot;
}

export function subscribeToSession(listener: Listener): () => void {
  listeners.add(listener);
  return () => listeners.delete(listener);
}

export function currentToken(): string | null {
  return getSessionSnapshot().session?.token ?? null;
}

export function startSession(session: Session): void {
  writeStoredSession(session);
  publish({ session, endReason: null });
}

export function endSession(reason: SessionEndReason): void {
  if (!getSessionSnapshot().session) return;
  writeStoredSession(null);
  publish({ session: null, endReason: reason });
}

/** Keeps the stored user current (roles or name changed by an administrator). */
export function replaceSessionUser(user: User): void {
  const { session } = getSessionSnapshot();
  if (!session || session.user.id !== user.id) return;
  if (JSON.stringify(session.user) === JSON.stringify(user)) return;
  const next = { ...session, user };
  writeStoredSession(next);
  publish({ session: next, endReason: null });
}

export function sessionExpiresInMs(session: Session, now = Date.now()): number {
  return Date.parse(session.expiresAt) - now;
}

/** Another browser tab signed in or out: follow it. */
export function followOtherTabs(): () => void {
  if (typeof window === 'undefined' || typeof window.addEventListener !== 'function') return () => undefined;
  const onStorage = (event: StorageEvent) => {
    if (event.key !== STORAGE_KEY) return;
    const stored = readStoredSession();
    const current = getSessionSnapshot().session;
    if (stored?.token === current?.token) return;
    publish({ session: stored, endReason: stored ? null : 'signed-out' });
  };
  window.addEventListener('storage', onStorage);
  return () => window.removeEventListener('storage', onStorage);
}
