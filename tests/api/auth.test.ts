import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { agent, testApp, type TestContext } from '../support/test-app';
import { PASSWORD, world } from '../support/factories';

let t: TestContext;
let w: Awaited<ReturnType<typeof world>>;
beforeAll(async () => {
  t = await testApp({ config: { LOGIN_MAX_PER_ACCOUNT: 5, LOGIN_MAX_PER_IP: 50 } });
  w = await world(t.database.db);
});
afterAll(() => t.close());

describe('health and unknown routes', () => {
  it('reports the store it runs on', async () => {
    const res = await request(t.app).get('/api/health');
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ ok: true, db: t.database.kind });
  });

  it('answers an unknown API route with a JSON 404, never the page', async () => {
    const res = await request(t.app).get('/api/no-such-thing');
    expect(res.status).toBe(404);
    expect(res.headers['content-type']).toMatch(/json/);
    expect(res.body.error.code).toBe('not_found');
  });
});

describe('sign-in', () => {
  it('signs in with e-mail and password, on a new session id', async () => {
    const a = await agent(t.app);
    const before = a.raw.jar.getCookie('lashline.sid', { path: '/', domain: '127.0.0.1', secure: false, script: false });
    const res = await a.login(w.people.manager.email, PASSWORD);
    expect(res.status).toBe(200);
    expect(res.body.user).toMatchObject({ id: w.people.manager.id, email: w.people.manager.email, role: 'manager' });
    expect(res.body.user).not.toHaveProperty('passwordHash');
    const cookie = String(res.headers['set-cookie']);
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    // The session is regenerated at sign-in (session fixation): the id differs from the one before.
    const sid = /lashline\.sid=([^;]+)/.exec(cookie)?.[1];
    expect(sid).toBeTruthy();
    expect(sid).not.toBe(before?.value);
    const me = await a.get('/api/auth/me');
    expect(me.status).toBe(200);
    expect(me.body.user.email).toBe(w.people.manager.email);
  });

  it('gives one message for a wrong password and an unknown account', async () => {
    const a = await agent(t.app);
    const wrong = await a.login(w.people.desk.email, 'not-the-password');
    const unknown = await a.login('nobody@example.test', 'not-the-password');
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(wrong.body.error.message).toBe(unknown.body.error.message);
  });

  it('refuses sign-in without the CSRF token', async () => {
    const res = await request(t.app).post('/api/auth/login').send({ email: w.people.manager.email, password: PASSWORD });
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('csrf_failed');
  });

  it('refuses an unsafe request sent from another site even with a token', async () => {
    const a = await agent(t.app);
    const res = await a.raw
      .post('/api/auth/login')
      .set('x-csrf-token', a.token)
      .set('Sec-Fetch-Site', 'cross-site')
      .send({ email: w.people.manager.email, password: PASSWORD });
    expect(res.status).toBe(403);
    const origin = await a.raw
      .post('/api/auth/login')
      .set('x-csrf-token', a.token)
      .set('Origin', 'http://evil.test')
      .send({ email: w.people.manager.email, password: PASSWORD });
    expect(origin.status).toBe(403);
  });

  it('answers a malformed body with the field errors', async () => {
    const a = await agent(t.app);
    const res = await a.post('/api/auth/login').send({ email: 'not an email' });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.details.map((d: { path: string }) => d.path)).toEqual(expect.arrayContaining(['email', 'password']));
  });

  it('signs out and ends the session on the server', async () => {
    const a = await agent(t.app);
    await a.login(w.people.desk.email, PASSWORD);
    const out = await a.post('/api/auth/logout');
    expect(out.status).toBe(204);
    expect((await a.get('/api/auth/me')).status).toBe(401);
  });

  it('throttles repeated failures on one account with 429', async () => {
    const a = await agent(t.app);
    const codes: number[] = [];
    for (let i = 0; i < 7; i++) codes.push((await a.login(w.people.technicianB.email, `wrong-${i}-password`)).status);
    expect(codes.slice(0, 5).every((c) => c === 401)).toBe(true);
    expect(codes.at(-1)).toBe(429);
  });

  it('refuses a disabled account', async () => {
    const { users } = await import('../../server/db/schema');
    const { eq } = await import('drizzle-orm');
    const { makeUser } = await import('../support/factories');
    const u = await makeUser(t.database.db, 'desk', [w.siteA.id]);
    await t.database.db.update(users).set({ disabled: true }).where(eq(users.id, u.id));
    const a = await agent(t.app);
    expect((await a.login(u.email, PASSWORD)).status).toBe(401);
  });
});
