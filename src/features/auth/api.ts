import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api, ApiError, setCsrfToken } from '../../lib/api-client';
import { LoginResultSchema, MeSchema, type Login, type Setup } from '../../../shared/schemas/auth';

export const authQueries = {
  all: () => ['auth'] as const,
  me: () =>
    queryOptions({
      queryKey: [...authQueries.all(), 'me'],
      queryFn: async () => {
        try {
          return (await api.get('/api/auth/me', MeSchema)).user;
        } catch (e) {
          if (e instanceof ApiError && e.status === 401) return null;
          throw e;
        }
      },
      staleTime: 60_000,
    }),
  setup: () => queryOptions({ queryKey: [...authQueries.all(), 'setup'], queryFn: () => api.get('/api/auth/setup', z.object({ needed: z.boolean() })) }),
};

function useSignedIn() {
  const qc = useQueryClient();
  return (r: z.infer<typeof LoginResultSchema>) => {
    setCsrfToken(r.csrfToken);
    qc.clear();
    qc.setQueryData(authQueries.me().queryKey, r.user);
  };
}

export function useLogin() {
  const done = useSignedIn();
  return useMutation({ mutationFn: (b: Login) => api.post('/api/auth/login', b, LoginResultSchema), onSuccess: done });
}

export function useSetup() {
  const done = useSignedIn();
  return useMutation({ mutationFn: (b: Setup) => api.post('/api/auth/setup', b, LoginResultSchema), onSuccess: done });
}

export function useAcceptInvite() {
  const done = useSignedIn();
  return useMutation({
    mutationFn: (b: { token: string; password: string }) => api.post('/api/auth/accept-invite', b, LoginResultSchema),
    onSuccess: done,
  });
}

export function useLogout() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: () => api.post('/api/auth/logout', {}),
    onSettled: () => {
      setCsrfToken(null);
      qc.clear();
      qc.setQueryData(authQueries.me().queryKey, null);
    },
  });
}
