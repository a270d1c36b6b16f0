// Keeps a page with unsaved work from being left without a question (lib/leaveGuard.ts): the
// shell's links and Sign out ask through the guard; the browser's back and forward buttons are held
// until the person answers (lib/historyGuard.ts); the router's own removals of the screen ask too; and
// reloading or closing the tab gets the browser's own prompt.
import { useEffect, useState } from 'react';
import { Platform } from 'react-native';
import { useNavigation } from 'expo-router';
import { usePreventRemove, type NavigationAction } from 'expo-router/react-navigation';
import { holdHistory } from '../lib/historyGuard';
import { requestLeave, setLeaveGuard } from '../lib/leaveGuard';

/** `reason`: what leaving would lose ("Version 3 (draft) has unsaved changes."), or null when nothing would. */
export function useLeaveGuard(reason: string | null): void {
  const navigation = useNavigation();
  // A removal the person agreed to: the guard is released first, then the removal is done again.
  const [agreed, setAgreed] = useState<{ action: NavigationAction } | null>(null);

  useEffect(() => {
    setLeaveGuard(agreed ? null : reason);
  }, [reason, agreed]);
  useEffect(() => () => setLeaveGuard(null), []);

  useEffect(() => {
    if (!reason || agreed || Platform.OS !== 'web' || typeof window === 'undefined') return;
    const onBeforeUnload = (event: BeforeUnloadEvent) => {
      event.preventDefault();
      // Older browsers show their prompt only when returnValue is set.
      event.returnValue = '';
    };
    window.addEventListener('beforeunload', onBeforeUnload);
    holdHistory(true);
    return () => {
      window.removeEventListener('beforeunload', onBeforeUnload);
      holdHistory(false);
    };
  }, [reason, agreed]);

  usePreventRemove(reason !== null && !agreed, ({ data }) => {
    requestLeave(() => setAgreed({ action: data.action }));
  });

  useEffect(() => {
    if (agreed) navigation.dispatch(agreed.action);
  }, [agreed, navigation]);
}
