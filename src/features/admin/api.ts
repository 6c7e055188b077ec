import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../lib/api-client';
import { InviteResultSchema, UserListSchema, type Invite, type UserUpdate } from '../../../shared/schemas/users';

export const userQueries = {
  all: () => ['users'] as const,
  list: () => queryOptions({ queryKey: [...userQueries.all(), 'list'], queryFn: () => api.get('/api/admin/users', UserListSchema) }),
};

export function useInvite() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (b: Invite) => api.post('/api/admin/users', b, InviteResultSchema),
    onSuccess: () => qc.invalidateQueries({ queryKey: userQueries.all() }),
  });
}

export function useUpdateUser() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, ...b }: UserUpdate & { id: string }) => api.patch(`/api/admin/users/${id}`, b),
    onSuccess: () => qc.invalidateQueries({ queryKey: userQueries.all() }),
  });
}

export function useCreateSite() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (b: { name: string; timeZone: string; bays: number }) => api.post('/api/sites', b),
    onSuccess: () => qc.invalidateQueries({ queryKey: ['sites'] }),
  });
}
