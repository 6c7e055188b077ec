import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { agent, testApp, type Agent, type TestContext } from '../support/test-app';
import { PASSWORD, world } from '../support/factories';

let t: TestContext;
let w: Awaited<ReturnType<typeof world>>;
let admin: Agent;
beforeAll(async () => {
  t = await testApp();
  w = await world(t.database.db);
  admin = await agent(t.app);
  await admin.login(w.people.admin.email, PASSWORD);
});
afterAll(() => t.close());

describe('people administration', () => {
  it('is for administrators only', async () => {
    const m = await agent(t.app);
    await m.login(w.people.manager.email, PASSWORD);
    expect((await m.get('/api/admin/users')).status).toBe(403);
    expect((await m.post('/api/admin/users').send({})).status).toBe(403);
  });

  it('invites a person, who sets a password and signs in', async () => {
    const res = await admin.post('/api/admin/users').send({ name: 'New Tech', email: 'New.Tech@Example.test', role: 'technician', siteIds: [w.siteA.id] });
    expect(res.status).toBe(201);
    expect(res.body.user).toMatchObject({ email: 'new.tech@example.test', role: 'technician', hasPassword: false });
    const token = res.body.invitePath.split('/').pop();
    const guest = await agent(t.app);
    const weak = await guest.post('/api/auth/accept-invite').send({ token, password: 'password123' });
    expect(weak.status).toBe(400);
    const ok = await guest.post('/api/auth/accept-invite').send({ token, password: 'a-long-phrase-of-mine' });
    expect(ok.status).toBe(200);
    expect(ok.body.user.role).toBe('technician');
    const again = await (await agent(t.app)).post('/api/auth/accept-invite').send({ token, password: 'a-long-phrase-of-mine' });
    expect(again.status).toBe(400);
  });

  it('refuses a duplicate e-mail with 409', async () => {
    const res = await admin.post('/api/admin/users').send({ name: 'X', email: w.people.desk.email, role: 'desk', siteIds: [w.siteA.id] });
    expect(res.status).toBe(409);
    expect(res.body.error.details[0].path).toBe('email');
  });

  it('changes a role and ends that person’s sessions', async () => {
    const desk = await agent(t.app);
    await desk.login(w.people.desk.email, PASSWORD);
    expect((await desk.get('/api/auth/me')).status).toBe(200);
    const res = await admin.patch(`/api/admin/users/${w.people.desk.id}`).send({ role: 'technician' });
    expect(res.status).toBe(200);
    expect(res.body.user.role).toBe('technician');
    expect((await desk.get('/api/auth/me')).status).toBe(401);
  });

  it('disables an account: its sessions end and it cannot sign in', async () => {
    const tech = await agent(t.app);
    await tech.login(w.people.technicianB.email, PASSWORD);
    expect((await admin.patch(`/api/admin/users/${w.people.technicianB.id}`).send({ disabled: true })).status).toBe(200);
    expect((await tech.get('/api/auth/me')).status).toBe(401);
    expect((await (await agent(t.app)).login(w.people.technicianB.email, PASSWORD)).status).toBe(401);
  });

  it('will not let an administrator lock themself out', async () => {
    const res = await admin.patch(`/api/admin/users/${w.people.admin.id}`).send({ disabled: true });
    expect(res.status).toBe(409);
  });
});
