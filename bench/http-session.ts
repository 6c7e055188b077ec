import { DEMO_PASSWORD, MANAGER_EMAIL } from './args';

export interface Session {
  cookie: string;
  csrf: string;
}

const cookieOf = (res: Response, fallback = '') =>
  res.headers.getSetCookie().map((c) => c.split(';')[0]).find((c) => c.startsWith('lashline.sid=')) ?? fallback;

/** Signs in as the manager the way the client does: a CSRF token first, then the login, on one session cookie. */
export async function signIn(url: string, email = MANAGER_EMAIL, password = DEMO_PASSWORD): Promise<Session> {
  const first = await fetch(`${url}/api/auth/csrf`);
  const { token } = (await first.json()) as { token: string };
  const res = await fetch(`${url}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'x-csrf-token': token, cookie: cookieOf(first) },
    body: JSON.stringify({ email, password }),
  });
  if (res.status !== 200) throw new Error(`Signing in as ${email} answered ${res.status}: ${await res.text()}`);
  const body = (await res.json()) as { csrfToken: string };
  return { cookie: cookieOf(res, cookieOf(first)), csrf: body.csrfToken };
}

/** One request with the session, timed, for the per-request statement profiles. */
export async function timedRequest(url: string, s: Session, path: string, init: { method?: string; body?: unknown } = {}) {
  const t0 = performance.now();
  const res = await fetch(`${url}${path}`, {
    method: init.method ?? 'GET',
    headers: { cookie: s.cookie, 'x-csrf-token': s.csrf, ...(init.body ? { 'content-type': 'application/json' } : {}) },
    body: init.body ? JSON.stringify(init.body) : undefined,
  });
  const text = await res.text();
  return { status: res.status, ms: performance.now() - t0, bytes: text.length, text };
}
