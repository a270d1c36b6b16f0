import type { User } from '../../shared/api/auth';

/** What an administrator can do to one user from the list. */
export interface UserRowActions {
  currentUserId: string;
  onEdit: (user: User) => void;
  onToggleActive: (user: User) => void;
  onUnlock: (user: User) => void;
}

/** Nobody can lock themselves out: their own account cannot be deactivated from here. */
export function canToggleActive(user: User, currentUserId: string): boolean {
  return user.id !== currentUserId;
}
