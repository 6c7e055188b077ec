import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import request from 'supertest';
import { eq } from 'drizzle-orm';
import { agent, manualClock, testApp, type TestContext } from '../support/test-app';
import { PASSWORD, world } from '../support/factories';
import { sessions } from '../../server/db/schema';

const clock = manualClock('2026-06-15T08:00:00Z');
let t: TestContext;
let w: Awaited<ReturnType<typeof world>>;
beforeAll(async () => {
  t = await testApp({ now: clock.now, config: { LOGIN_MAX_PER_IP: 1000 } });
  w = await world(t.database.db);
});
afterAll(() => t.close());

describe('sessions (OWASP ASVS 5.0 V7)', () => {
  it('sets an httpOnly, SameSite cookie that expires after 30 idle minutes by default (V7.3.1)', async () => {
    const a = await agent(t.app);
    const res = await a.login(w.people.desk.email, PASSWORD);
    const cookie = String(res.headers['set-cookie']);
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    const expires = /Expires=([^;]+)/i.exec(cookie)?.[1];
    const minutes = (new Date(expires!).getTime() - Date.now()) / 60_000;
    expect(minutes).toBeGreaterThan(29);
    expect(minutes).toBeLessThanOrEqual(30);
  });

  it('ends an idle session on the server, whatever the browser keeps (V7.3.1)', async () => {
    const a = await agent(t.app);
    await a.login(w.people.desk.email, PASSWORD);
    expect((await a.get('/api/auth/me')).status).toBe(200);
    const [row] = await t.database.db.select().from(sessions).where(eq(sessions.userId, w.people.desk.id)).limit(1);
    await t.database.db.update(sessions).set({ expire: new Date(Date.now() - 1000) }).where(eq(sessions.userId, w.people.desk.id));
    expect(row).toBeTruthy();
    expect((await a.get('/api/auth/me')).status).toBe(401);
  });

  it('ends a session removed from the database at once, and reads a live one only once on embedded PGlite (V7.4.1)', async () => {
    const a = await agent(t.app);
    await a.login(w.people.desk.email, PASSWORD);
    // The spy calls through to PGlite and keeps the statements it was given.
    const query = t.database.pglite ? vi.spyOn(t.database.pglite, 'query') : undefined;
    try {
      for (let i = 0; i < 3; i++) expect((await a.get('/api/auth/me')).status).toBe(200);
      if (query) expect(query.mock.calls.filter(([q]) => /from "sessions"/.test(String(q))).length).toBeLessThanOrEqual(1);
    } finally {
      query?.mockRestore();
    }
    // Straight on the database, not through the app (an operator ending every session by hand).
    await t.database.db.delete(sessions).where(eq(sessions.userId, w.people.desk.id));
    expect((await a.get('/api/auth/me')).status).toBe(401);
  });

  it('moves the stored expiry on at most once a minute, however many requests come', async () => {
    const a = await agent(t.app);
    await a.login(w.people.technician.email, PASSWORD);
    const stored = async () => (await t.database.db.select().from(sessions).where(eq(sessions.userId, w.people.technician.id)))[0].expire.getTime();
    const atSignIn = await stored();
    for (let i = 0; i < 5; i++) expect((await a.get('/api/auth/me')).status).toBe(200);
    // Within the minute after the sign-in wrote it, no request rewrites the row.
    expect(await stored()).toBe(atSignIn);
  });

  it('ends a session after 12 hours however active it was (V7.3.2)', async () => {
    const a = await agent(t.app);
    await a.login(w.people.manager.email, PASSWORD);
    for (let h = 0; h < 11; h++) {
      clock.advance(3_600_000);
      expect((await a.get('/api/auth/me')).status).toBe(200);
    }
    clock.advance(2 * 3_600_000);
    expect((await a.get('/api/auth/me')).status).toBe(401);
  });

  it('kills the session on the server at sign-out: the old cookie is refused (V7.4.1)', async () => {
    const a = await agent(t.app);
    const res = await a.login(w.people.technician.email, PASSWORD);
    const sid = /lashline\.sid=[^;]+/.exec(String(res.headers['set-cookie']))![0];
    await a.post('/api/auth/logout');
    expect((await request(t.app).get('/api/auth/me').set('Cookie', sid)).status).toBe(401);
  });
});

describe('passwords (V6.2)', () => {
  it('takes at least 8 characters, allows 64 and more, and refuses common ones', async () => {
    const admin = await agent(t.app);
    await admin.login(w.people.admin.email, PASSWORD);
    const invite = async (email: string) => (await admin.post('/api/admin/users').send({ name: 'New', email, role: 'desk', siteIds: [w.siteA.id] })).body.invitePath.split('/').pop();
    const guest = await agent(t.app);
    expect((await guest.post('/api/auth/accept-invite').send({ token: await invite('short@example.test'), password: 'seven77' })).status).toBe(400);
    expect((await guest.post('/api/auth/accept-invite').send({ token: await invite('common@example.test'), password: 'password123' })).status).toBe(400);
    const long = 'a quiet harbour at low tide smells of salt and old rope, always'.padEnd(72, '!');
    expect(long.length).toBeGreaterThanOrEqual(64);
    expect((await guest.post('/api/auth/accept-invite').send({ token: await invite('long@example.test'), password: long })).status).toBe(200);
  });
});

describe('transport and headers', () => {
  it('marks the cookie Secure behind an HTTPS proxy with trust proxy set (V3.3.1)', async () => {
    const s = await testApp({ config: { COOKIE_SECURE: true, TRUST_PROXY: '1' } });
    try {
      const w2 = await world(s.database.db);
      // A cookie jar will not send a Secure cookie over plain HTTP, so carry it by hand.
      const csrf = await request(s.app).get('/api/auth/csrf').set('X-Forwarded-Proto', 'https');
      const cookie = String(csrf.headers['set-cookie']).split(';')[0];
      expect(String(csrf.headers['set-cookie'])).toMatch(/Secure/);
      const res = await request(s.app).post('/api/auth/login').set('Cookie', cookie).set('X-Forwarded-Proto', 'https').set('x-csrf-token', csrf.body.token).send({ email: w2.people.desk.email, password: PASSWORD });
      expect(res.status).toBe(200);
      expect(String(res.headers['set-cookie'])).toMatch(/Secure/);
      expect(res.headers['strict-transport-security']).toBeTruthy();
    } finally {
      await s.close();
    }
  });

  it('sends a Content-Security-Policy that allows only our own origin (V3.4.3)', async () => {
    const res = await request(t.app).get('/api/health');
    const csp = res.headers['content-security-policy'];
    expect(csp).toContain("default-src 'self'");
    expect(csp).toContain("font-src 'self'");
    expect(csp).not.toMatch(/https?:\/\//);
    expect(res.headers['x-content-type-options']).toBe('nosniff');
  });

  it('throttles sign-in per address (V6.3.1)', async () => {
    const s = await testApp({ config: { LOGIN_MAX_PER_IP: 3, LOGIN_MAX_PER_ACCOUNT: 100 } });
    try {
      const a = await agent(s.app);
      const codes = [];
      for (const email of ['a@x.test', 'b@x.test', 'c@x.test', 'd@x.test']) codes.push((await a.login(email, 'whatever-it-is')).status);
      expect(codes).toEqual([401, 401, 401, 429]);
    } finally {
      await s.close();
    }
  });
});
