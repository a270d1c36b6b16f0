import { Redirect, useLocalSearchParams } from 'expo-router';
import { SignInScreen } from '../components/SignInScreen';
import { useSession } from '../hooks/useSession';
import { safeReturnPath } from '../lib/navigation';

export default function SignInRoute() {
  const { user, endReason } = useSession();
  const { next } = useLocalSearchParams<{ next?: string }>();
  if (user) return <Redirect href={safeReturnPath(next)} />;
  return <SignInScreen endReason={endReason} />;
}
