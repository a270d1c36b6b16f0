import { useLayout } from '../hooks/useLayout';
import { useSession } from '../hooks/useSession';
import { HomeOverview } from './HomeOverview';
import { KernwrightWordmark } from './KernwrightMark';
import { Screen } from './Screen';
import { SignOutButton } from './SignOutButton';

export function HomeScreen() {
  const { user } = useSession();
  const layout = useLayout();
  if (!user) return null;
  return (
    <Screen
      title="Home"
      subtitle={`Signed in as ${user.displayName}. Here is what you can do next.`}
      width="reading"
      eyebrow={layout === 'phone' ? <KernwrightWordmark /> : undefined}
      actions={layout === 'phone' ? <SignOutButton /> : undefined}
    >
      <HomeOverview user={user} />
    </Screen>
  );
}
