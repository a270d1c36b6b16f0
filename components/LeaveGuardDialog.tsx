// Asks before a navigation drops unsaved work (lib/leaveGuard.ts): the person stays, or goes on and
// loses it.
import { useSyncExternalStore } from 'react';
import { cancelLeave, confirmLeave, leaveGuardState, subscribeLeaveGuard } from '../lib/leaveGuard';
import { ConfirmDialog } from './ConfirmDialog';

export function LeaveGuardDialog() {
  const { reason, asking } = useSyncExternalStore(subscribeLeaveGuard, leaveGuardState, leaveGuardState);
  return (
    <ConfirmDialog
      visible={asking}
      title="Leave without saving?"
      message={`${reason ?? 'This page has unsaved changes.'} If you leave now, they are lost.`}
      confirmLabel="Leave without saving"
      cancelLabel="Keep editing"
      destructive
      onConfirm={confirmLeave}
      onCancel={cancelLeave}
    />
  );
}
