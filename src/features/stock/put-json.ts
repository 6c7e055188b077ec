import { api, ApiError } from '../../lib/api-client';
import type { ApiErrorBody } from '../../../shared/errors';
import { CsrfSchema } from '../../../shared/schemas/auth';

let token: string | null = null;

/**
 * A PUT in the same shape as the shared client's requests (CSRF header, JSON, ApiError),
 * which has no PUT of its own. `keepalive` lets a save started as the screen locks finish.
 */
export async function putJson(url: string, body: unknown, opts: { keepalive?: boolean } = {}, retried = false): Promise<unknown> {
  token ??= (await api.get('/api/auth/csrf', CsrfSchema)).token;
  let res: Response;
  try {
    res = await fetch(url, {
      method: 'PUT',
      headers: { accept: 'application/json', 'content-type': 'application/json', 'x-csrf-token': token },
      credentials: 'same-origin',
      body: JSON.stringify(body),
      keepalive: opts.keepalive,
    });
  } catch {
    throw new ApiError(0, 'network', 'Lashline cannot be reached. Check the connection; what you typed is kept.');
  }
  if (res.status === 204) return null;
  const data = await res.json().catch(() => null);
  if (!res.ok) {
    const err = (data as ApiErrorBody | null)?.error;
    if (err?.code === 'csrf_failed' && !retried) {
      token = null;
      return putJson(url, body, opts, true);
    }
    throw new ApiError(res.status, err?.code ?? 'internal', err?.message ?? `The server answered ${res.status}.`, err?.details);
  }
  return data;
}
