import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api, ApiError, setCsrfToken } from '../../lib/api-client';
import { deviceDel, deviceGet, deviceSet, queryPersister } from '../../lib/offline/device-store';
import { dropChangesOf } from '../../lib/offline/queue';
import { forgetDrafts } from '../../lib/use-draft';
import { LoginResultSchema, MeSchema, type Login, type Setup } from '../../../shared/schemas/auth';

const SIGNED_OUT_KEY = 'lashline.signed-out';

/**
 * Ends on the server a session that was signed out on this device without a connection. True when
 * there was one to end. Called on start, when the connection comes back, and before asking who is
 * signed in.
 */
export async function settleSignOut(): Promise<boolean> {
  if (!(await deviceGet<boolean>(SIGNED_OUT_KEY).catch(() => false))) return false;
  await api.post('/api/auth/logout', {}).catch((e: unknown) => {
    if (!(e instanceof ApiError && (e.status === 401 || e.status === 403))) throw e;
  });
  await deviceDel(SIGNED_OUT_KEY);
  return true;
}

export const authQueries = {
  all: () => ['auth'] as const,
  me: () =>
    queryOptions({
      queryKey: [...authQueries.all(), 'me'],
      queryFn: async () => {
        // Signed out while offline: the server's session ends before anyone is let in again.
        if (await settleSignOut()) return null;
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

/**
 * Signs out and clears what this device holds for the person: the answers kept for reading offline
 * and their waiting changes (the screen warns first). Without a connection the server is told as
 * soon as there is one, before anyone can sign in again.
 */
export function useLogout(userId: string) {
  const qc = useQueryClient();
  return useMutation({
    // Signing out works without a connection: it is not held back until one comes.
    networkMode: 'always',
    mutationFn: async () => {
      try {
        await api.post('/api/auth/logout', {});
      } catch (e) {
        if (e instanceof ApiError && e.code === 'network') await deviceSet(SIGNED_OUT_KEY, true);
        else throw e;
      }
    },
    onSettled: async () => {
      setCsrfToken(null);
      qc.clear();
      qc.setQueryData(authQueries.me().queryKey, null);
      await dropChangesOf(userId);
      await queryPersister.removeClient();
      forgetDrafts();
    },
  });
}
