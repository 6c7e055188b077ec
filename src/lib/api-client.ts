import type { ZodType, z } from 'zod';
import type { ApiErrorBody, ErrorCode, ErrorDetail } from '../../shared/errors';

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

async function send(method: string, url: string, body?: unknown, retried = false, keepalive = false): Promise<unknown> {
  const headers: Record<string, string> = { accept: 'application/json' };
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
      return send(method, url, body, true, keepalive);
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
    const data = await send('PUT', url, body, false, opts.keepalive);
    return schema ? schema.parse(data) : (data as z.infer<S>);
  },
  delete: (url: string) => send('DELETE', url),
};
