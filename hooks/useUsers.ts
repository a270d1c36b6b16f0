// Users of Kernwright (administrators only), through react-query.
import { keepPreviousData, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Role } from '../shared/roles';
import type { CreateUserRequest, UpdateUserRequest } from '../shared/api/users';
import { createUser, listUsers, updateUser } from '../lib/api';
import { replaceSessionUser } from '../lib/session';

export interface UserFilters {
  search: string;
  role: Role | null;
  active: boolean | null;
  limit: number;
  offset: number;
}

export const userKeys = {
  all: ['users'] as const,
  lists: () => [...userKeys.all, 'list'] as const,
  list: (filters: UserFilters) => [...userKeys.lists(), filters] as const,
};

export function useUserList(filters: UserFilters) {
  return useQuery({
    queryKey: userKeys.list(filters),
    queryFn: ({ signal }) =>
      listUsers(
        {
          q: filters.search.trim() || undefined,
          role: filters.role ?? undefined,
          active: filters.active === null ? undefined : filters.active ? 'true' : 'false',
          limit: filters.limit,
          offset: filters.offset,
        },
        signal,
      ),
    // Keep the current page on screen while the next one loads, so the table does not jump.
    placeholderData: keepPreviousData,
  });
}

export function useCreateUser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateUserRequest) => createUser(body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: userKeys.all }),
  });
}

export function useUpdateUser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, changes }: { id: string; changes: UpdateUserRequest }) => updateUser(id, changes),
    onSuccess: (user) => {
      replaceSessionUser(user);
      return queryClient.invalidateQueries({ queryKey: userKeys.all });
    },
  });
}
