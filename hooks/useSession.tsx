// The signed-in person, for every screen: who they are, their roles, and how to sign in and out.
import { createContext, useCallback, useContext, useEffect, useMemo, useSyncExternalStore, type ReactNode } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { SignInRequest, User } from '../shared/api/auth';
import { fetchCurrentUser, signIn, signOut } from '../lib/api';
import {
  endSession,
  followOtherTabs,
  getSessionSnapshot,
  replaceSessionUser,
  sessionExpiresInMs,
  startSession,
  subscribeToSession,
  type SessionEndReason,
} from '../lib/session';

export const sessionKeys = {
  currentUser: (token: string) => ['session', 'current-user', token] as const,
};

interface SessionValue {
  user: User | null;
  endReason: SessionEndReason | null;
  signOut: () => Promise<void>;
}

const SessionContext = createContext<SessionValue | null>(null);

// setTimeout fires at once for delays above 2^31 - 1 ms.
const LONGEST_TIMER_MS = 2_147_483_647;

export function SessionProvider({ children }: { children: ReactNode }) {
  const queryClient = useQueryClient();
  const { session, endReason } = useSyncExternalStore(subscribeToSession, getSessionSnapshot, getSessionSnapshot);
  const token = session?.token ?? null;

  useEffect(() => followOtherTabs(), []);

  // A stored session is re-checked once: the account may have been deactivated or its roles changed.
  const currentUser = useQuery({
    queryKey: sessionKeys.currentUser(token ?? ''),
    queryFn: ({ signal }) => fetchCurrentUser(signal),
    enabled: token !== null,
    staleTime: Infinity,
  });
  useEffect(() => {
    if (currentUser.data) replaceSessionUser(currentUser.data);
  }, [currentUser.data]);

  useEffect(() => {
    if (!session) return;
    const timer = setTimeout(() => endSession('expired'), Math.min(Math.max(sessionExpiresInMs(session), 0), LONGEST_TIMER_MS));
    return () => clearTimeout(timer);
  }, [session]);

  // Nothing fetched for one person may be shown to the next one on this device.
  useEffect(() => {
    if (!token) queryClient.clear();
  }, [token, queryClient]);

  const endOwnSession = useCallback(async () => {
    try {
      await signOut();
    } catch {
      // The server may be unreachable or the token already expired; the device forgets the session anyway.
    }
    endSession('signed-out');
  }, []);

  const value = useMemo<SessionValue>(
    () => ({ user: session?.user ?? null, endReason, signOut: endOwnSession }),
    [session, endReason, endOwnSession],
  );
  return <SessionContext.Provider value={value}>{children}</SessionContext.Provider>;
}

export function useSession(): SessionValue {
  const value = useContext(SessionContext);
  if (!value) throw new Error('useSession needs a SessionProvider above it (app/_layout.tsx)');
  return value;
}

export function useSignIn() {
  return useMutation({
    mutationFn: (credentials: SignInRequest) => signIn(credentials),
    onSuccess: (response) => startSession(response),
  });
}
