import type { ZodType, z } from 'zod';
import type { ApiErrorBody, ErrorCode, ErrorDetail } from '../../shared/errors';
import { IDEMPOTENCY_HEADER } from '../../shared/domain/idempotency';
import { newKey } from './offline/key';

export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: ErrorCode | 'network',
    message: string,
    readonly details: ErrorDetail[] = [],
  ) {
    super(message);
  }
  /** The message for one field, for showing beside it in a form. */
  field(path: string) {
    return this.details.find((d) => d.path === path)?.message;
  }
}

let csrfToken: string | null = null;

export function setCsrfToken(token: string | null) {
  csrfToken = token;
}

async function token() {
  if (!csrfToken) {
    const res = await fetch('/api/auth/csrf', { credentials: 'same-origin' });
    csrfToken = ((await res.json()) as { token: string }).token;
  }
  return csrfToken;
}

type Query = Record<string, string | number | boolean | undefined | null>;

function withQuery(url: string, q?: Query) {
  if (!q) return url;
  const p = new URLSearchParams();
  for (const [k, v] of Object.entries(q)) if (v !== undefined && v !== null && v !== '') p.set(k, String(v));
  const s = p.toString();
  return s ? `${url}?${s}` : url;
}

interface SendOptions {
  keepalive?: boolean;
  /** The change's Idempotency-Key: the same on every try of it, so the server applies it once. */
  key?: string;
  retried?: boolean;
}

async function send(method: string, url: string, body?: unknown, opts: SendOptions = {}): Promise<unknown> {
  const { keepalive = false, retried = false } = opts;
  const headers: Record<string, string> = { accept: 'application/json' };
  // Every change carries a key of its own; a retry below (a new security token) sends the same one.
  const key = method === 'GET' ? undefined : (opts.key ?? newKey());
  if (key) headers[IDEMPOTENCY_HEADER] = key;
  if (method !== 'GET') headers['x-csrf-token'] = await token();
  if (body !== undefined && !(body instanceof FormData)) headers['content-type'] = 'application/json';
  let res: Response;
  try {
    res = await fetch(url, {
      method,
      headers,
      credentials: 'same-origin',
      body: body === undefined ? undefined : body instanceof FormData ? body : JSON.stringify(body),
      // Lets a save started as the screen locks finish.
      keepalive,
    });
  } catch {
    throw new ApiError(0, 'network', 'Lashline cannot be reached. Check the connection; what you typed is kept.');
  }
  if (res.status === 204) return null;
  const data = await res.json().catch(() => null);
  if (!res.ok) {
    const err = (data as ApiErrorBody | null)?.error;
    // The token belongs to a session that has changed (signed in elsewhere, expired): get a new one once.
    if (err?.code === 'csrf_failed' && !retried) {
      csrfToken = null;
      return send(method, url, body, { keepalive, key, retried: true });
    }
    throw new ApiError(res.status, err?.code ?? 'internal', err?.message ?? `The server answered ${res.status}.`, err?.details);
  }
  return data;
}

export const api = {
  get: async <S extends ZodType>(url: string, schema: S, q?: Query): Promise<z.infer<S>> => schema.parse(await send('GET', withQuery(url, q))),
  post: async <S extends ZodType>(url: string, body: unknown, schema?: S): Promise<z.infer<S>> => {
    const data = await send('POST', url, body ?? {});
    return schema ? schema.parse(data) : (data as z.infer<S>);
  },
  patch: async <S extends ZodType>(url: string, body: unknown, schema?: S): Promise<z.infer<S>> => {
    const data = await send('PATCH', url, body);
    return schema ? schema.parse(data) : (data as z.infer<S>);
  },
  put: async <S extends ZodType>(url: string, body: unknown, schema?: S, opts: { keepalive?: boolean } = {}): Promise<z.infer<S>> => {
    const data = await send('PUT', url, body, { keepalive: opts.keepalive });
    return schema ? schema.parse(data) : (data as z.infer<S>);
  },
  delete: (url: string) => send('DELETE', url),
  /** One try of a change that may be tried again with the same key (the device's queue). */
  write: (method: 'POST' | 'PUT' | 'PATCH' | 'DELETE', url: string, body: unknown, key: string) => send(method, url, body, { key }),
};
