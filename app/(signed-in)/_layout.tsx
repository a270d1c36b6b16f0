import { useRef } from 'react';
import { Redirect, Slot, usePathname } from 'expo-router';
import { AppShell } from '../../components/AppShell';
import { useSession } from '../../hooks/useSession';

export default function SignedInLayout() {
  const { user, endReason } = useSession();
  const pathname = usePathname();
  // The router reports "/" while it redirects, so the page asked for is kept from the first signed-out render.
  const returnPath = useRef<string | null>(null);
  if (user) returnPath.current = null;
  else if (returnPath.current === null) returnPath.current = pathname;

  if (!user) {
    // After a deliberate sign-out the next person starts at Home; after an expiry the same person comes back.
    const next = endReason === 'signed-out' ? null : returnPath.current;
    return <Redirect href={next && next !== '/' ? `/sign-in?next=${encodeURIComponent(next)}` : '/sign-in'} />;
  }
  return (
    <AppShell user={user}>
      <Slot />
    </AppShell>
  );
}
