import type { ZodType, z } from 'zod';
import { api, ApiError } from './api-client';
import type { ApiErrorBody } from '../../shared/errors';
import { CsrfSchema } from '../../shared/schemas/auth';

let token: string | null = null;

async function putOnce(url: string, body: unknown, retried: boolean): Promise<unknown> {
  token ??= (await api.get('/api/auth/csrf', CsrfSchema)).token;
  let res: Response;
  try {
    res = await fetch(url, {
      method: 'PUT',
      headers: { accept: 'application/json', 'content-type': 'application/json', 'x-csrf-token': token },
      credentials: 'same-origin',
      body: JSON.stringify(body),
    });
  } catch {
    throw new ApiError(0, 'network', 'Lashline cannot be reached. Check the connection; what you typed is kept.');
  }
  if (res.status === 204) return null;
  const data = await res.json().catch(() => null);
  if (!res.ok) {
    const err = (data as ApiErrorBody | null)?.error;
    // The session changed since the token was fetched (signed in again): fetch a new one once.
    if (err?.code === 'csrf_failed' && !retried) {
      token = null;
      return putOnce(url, body, true);
    }
    throw new ApiError(res.status, err?.code ?? 'internal', err?.message ?? `The server answered ${res.status}.`, err?.details);
  }
  return data;
}

/** A PUT in the same shape as the shared client's requests (CSRF header, JSON, ApiError), which has no PUT of its own. */
export async function apiPut<S extends ZodType>(url: string, body: unknown, schema: S): Promise<z.infer<S>> {
  return schema.parse(await putOnce(url, body, false));
}
