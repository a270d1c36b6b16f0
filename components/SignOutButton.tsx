import { useState } from 'react';
import { useSession } from '../hooks/useSession';
import { requestLeave } from '../lib/leaveGuard';
import { Button, type ButtonVariant } from './Button';

export function SignOutButton({ variant = 'secondary' }: { variant?: ButtonVariant }) {
  const { signOut } = useSession();
  const [busy, setBusy] = useState(false);
  return (
    <Button
      label="Sign out"
      variant={variant}
      busy={busy}
      compact
      onPress={() =>
        requestLeave(() => {
          setBusy(true);
          void signOut();
        })
      }
    />
  );
}
