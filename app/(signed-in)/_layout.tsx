import { Redirect, Slot, usePathname } from 'expo-router';
import { AppShell } from '../../components/AppShell';
import { useSession } from '../../hooks/useSession';

export default function SignedInLayout() {
  const { user } = useSession();
  const pathname = usePathname();
  if (!user) {
    return <Redirect href={pathname && pathname !== '/' ? { pathname: '/sign-in', params: { next: pathname } } : '/sign-in'} />;
  }
  return (
    <AppShell user={user}>
      <Slot />
    </AppShell>
  );
}
