import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { randomUUID } from 'node:crypto';
import { agent, testApp, type Agent, type TestContext } from '../support/test-app';
import { PASSWORD, makeServiceItem, world } from '../support/factories';
import { listRoutes } from '../../server/route-table';
import { serviceTasks } from '../../server/db/schema';
import { ROLES, type Role } from '../../shared/roles';

// Who may call each route. Written out by hand, apart from the code, so a changed rule shows up here;
// a route missing from this table fails the test (OWASP Top 10 2021 A01: deny by default).
const ALL: Role[] = [...ROLES];
const EXPECTED: Record<string, Role[] | 'public'> = {
  'GET /api/health': 'public',
  'GET /api/auth/csrf': 'public',
  'POST /api/auth/login': 'public',
  'POST /api/auth/logout': ALL,
  'GET /api/auth/me': ALL,
  'GET /api/auth/setup': 'public',
  'POST /api/auth/setup': 'public',
  'POST /api/auth/accept-invite': 'public',
  'GET /api/bikes': ALL,
  'GET /api/bikes/:id': ALL,
  'POST /api/bikes': ['manager', 'admin'],
  'PATCH /api/bikes/:id': ['manager', 'admin'],
  'POST /api/bikes/:id/status': ['manager', 'technician', 'admin'],
  'GET /api/bikes/:id/timeline': ALL,
  'POST /api/bikes/:id/check-ins': ['desk', 'technician', 'manager', 'admin'],
  'GET /api/sites': ALL,
  'POST /api/sites': ['admin'],
  'PATCH /api/sites/:id': ['admin'],
  'GET /api/models': ALL,
  'GET /api/admin/users': ['admin'],
  'POST /api/admin/users': ['admin'],
  'PATCH /api/admin/users/:id': ['admin'],
  'GET /api/admin/mail': ['admin'],
  'GET /api/admin/mail/outbox': ['admin'],
  'GET /api/admin/mail/:id': ['admin'],
  'GET /api/admin/mail/:id/raw': ['admin'],
  'POST /api/admin/jobs/:name/run': ['admin'],
  'GET /api/due': ALL,
  'GET /api/due.csv': ALL,
  'GET /api/calendar/feed': ALL,
  'POST /api/calendar/feed/reset': ALL,
  'GET /api/calendar/:token': 'public',
  'GET /api/tasks': ['technician', 'manager', 'admin'],
  'GET /api/tasks/assignees': ['manager', 'admin'],
  'GET /api/tasks/:id': ALL,
  'POST /api/tasks/:id/assign': ['manager', 'admin'],
  'POST /api/tasks/:id/start': ['technician', 'manager'],
  'POST /api/tasks/:id/close': ['technician', 'manager'],
  'GET /api/tasks/:id/valve-card': ['technician', 'manager'],
  'PUT /api/tasks/:id/draft': ['technician', 'manager'],
  'POST /api/tasks/:id/valve-close': ['technician', 'manager'],
  'GET /api/bikes/:id/valves': ALL,
  'GET /api/valves/rollup': ['manager', 'admin', 'technician'],
  'GET /api/valves/warnings': ['manager', 'admin', 'technician'],
  'GET /api/stock/shims': ['technician', 'manager', 'admin'],
  'GET /api/stock/shims/reorder': ['technician', 'manager', 'admin'],
  'POST /api/stock/shims/adjust': ['technician', 'manager'],
  'PUT /api/stock/shims/minimum': ['manager'],
  'GET /api/models/:id': ALL,
  'POST /api/models': ['manager'],
  'PUT /api/models/:id': ['manager'],
  'POST /api/models/:id/items': ['manager'],
  'PUT /api/models/:id/items/:itemId': ['manager'],
  'DELETE /api/models/:id/items/:itemId': ['manager'],
  'GET /api/settings': ALL,
  'PUT /api/admin/settings': ['admin'],
  'POST /api/bikes/:id/attachments': ['desk', 'technician', 'manager'],
  'GET /api/bikes/:id/attachments': ALL,
  'GET /api/attachments/:id': ALL,
  'GET /api/attachments/:id/thumb': ALL,
  'DELETE /api/attachments/:id': ['desk', 'technician', 'manager'],
  'POST /api/import/:kind/preview': ['manager', 'admin'],
  'POST /api/import/:kind': ['manager', 'admin'],
  'GET /api/bikes/:id/service-record': ALL,
  'GET /api/bikes/:id/history.csv': ALL,
  'GET /api/capacity': ['manager', 'admin', 'technician'],
  'PUT /api/sites/:id/hours': ['manager', 'admin'],
  'POST /api/sites/:id/bays': ['manager', 'admin'],
  'PATCH /api/bays/:id': ['manager', 'admin'],
  'DELETE /api/bays/:id': ['manager', 'admin'],
  'POST /api/work-patterns': ['manager', 'admin'],
  'PATCH /api/work-patterns/:id': ['manager', 'admin'],
  'DELETE /api/work-patterns/:id': ['manager', 'admin'],
  'POST /api/time-off': ['manager', 'admin', 'technician'],
  'DELETE /api/time-off/:id': ['manager', 'admin', 'technician'],
  'GET /api/admin/backup': ['admin'],
  'POST /api/admin/restore': ['admin'],
  'GET /api/bookings': ALL,
  'POST /api/bookings': ['desk', 'manager', 'admin'],
  'POST /api/bookings/import/preview': ['desk', 'manager', 'admin'],
  'POST /api/bookings/import': ['desk', 'manager', 'admin'],
  'DELETE /api/bookings/:id': ['desk', 'manager', 'admin'],
  'GET /api/booking-feeds': ['manager', 'admin'],
  'POST /api/booking-feeds': ['manager', 'admin'],
  'DELETE /api/booking-feeds/:id': ['manager', 'admin'],
  'GET /api/plan': ['manager', 'admin', 'technician'],
  'POST /api/plan/run': ['manager', 'admin'],
  'PATCH /api/plan/visits/:id': ['manager', 'admin'],
  'GET /api/plan/my-day': ['technician', 'manager'],
  'GET /api/plan/next-visits': ALL,
  'GET /api/plan/settings': ['manager', 'admin'],
  'PUT /api/plan/settings': ['manager', 'admin'],
  'GET /api/parts': ['technician', 'manager', 'admin'],
  'GET /api/stock': ['technician', 'manager', 'admin'],
  'GET /api/stock/shortages': ['technician', 'manager', 'admin'],
  'POST /api/stock/movements': ['technician', 'manager'],
  'PUT /api/stock/minimum': ['manager'],
  'GET /api/forecast': ['technician', 'manager', 'admin'],
  'GET /api/purchase-orders': ['technician', 'manager', 'admin'],
  'POST /api/purchase-orders': ['manager'],
  'POST /api/purchase-orders/draft-from-forecast': ['manager'],
  'POST /api/purchase-orders/:id/send': ['manager'],
  'POST /api/purchase-orders/:id/cancel': ['manager'],
  'POST /api/purchase-orders/:id/receive': ['technician', 'manager'],
};

let t: TestContext;
let w: Awaited<ReturnType<typeof world>>;
const as = {} as Record<Role, Agent>;
beforeAll(async () => {
  t = await testApp();
  w = await world(t.database.db);
  for (const role of ROLES) {
    as[role] = await agent(t.app);
    await as[role].login(w.people[role].email, PASSWORD);
  }
});
afterAll(() => t.close());

const fill = (path: string) =>
  path.replace(':token', `${randomUUID()}.1.${'a'.repeat(43)}.ics`).replace(':name', 'due-scan').replace(/:[a-zA-Z]+/g, () => randomUUID());

describe('authorization matrix (ASVS 5.0 V8.2.1: function-level access; deny by default)', () => {
  it('has an expected rule for every route the app registers, and no stale ones', () => {
    const routes = listRoutes(t.app).filter((r) => r.path.startsWith('/api'));
    const keys = routes.map((r) => `${r.method} ${r.path}`);
    expect(keys.filter((k) => !(k in EXPECTED))).toEqual([]);
    expect(Object.keys(EXPECTED).filter((k) => !keys.includes(k))).toEqual([]);
  });

  it('refuses signed-out callers (401) and wrong roles (403) on every route, and lets the right roles through', async () => {
    const routes = listRoutes(t.app).filter((r) => r.path.startsWith('/api') && !['POST /api/auth/logout', 'POST /api/auth/login', 'POST /api/auth/setup', 'POST /api/auth/accept-invite'].includes(`${r.method} ${r.path}`));
    let checked = 0;
    for (const r of routes) {
      const rule = EXPECTED[`${r.method} ${r.path}`];
      if (!rule) continue; // reported by the test above
      const url = fill(r.path);
      const method = r.method.toLowerCase() as 'get' | 'post' | 'put' | 'patch' | 'delete';
      const anon = await request(t.app)[method](url).send({});
      if (rule === 'public') expect(anon.status, `${r.method} ${r.path} signed out`).not.toBe(401);
      else expect([401, 403], `${r.method} ${r.path} signed out`).toContain(anon.status);
      for (const role of ROLES) {
        const a = as[role];
        const res = method === 'get' ? await a.get(url) : await a[method](url).send({});
        const allowed = rule === 'public' || rule.includes(role);
        if (allowed) expect([401, 403], `${r.method} ${r.path} as ${role}`).not.toContain(res.status);
        else expect(res.status, `${r.method} ${r.path} as ${role}`).toBe(403);
        expect(res.status, `${r.method} ${r.path} as ${role}: no server error`).toBeLessThan(500);
        expect(res.headers['content-type'] ?? '', `${r.method} ${r.path}`).not.toMatch(/html/);
        checked++;
      }
    }
    console.log(`authorization matrix: ${routes.length} routes × ${ROLES.length} roles + signed out = ${checked + routes.length} requests`);
  });

  it('keeps a technician of one site off another site’s task (ASVS 5.0 V8.2.2: data-level access)', async () => {
    const item = await makeServiceItem(t.database.db, w.model.id, { name: 'Chain', category: 'chain', everyKm: 1000 });
    const [task] = await t.database.db.insert(serviceTasks).values({ bikeId: w.bikeA.id, serviceItemId: item.id, cycleKey: 'matrix' }).returning();
    const outsider = await agent(t.app);
    await outsider.login(w.people.technicianB.email, PASSWORD);
    expect((await outsider.post(`/api/tasks/${task.id}/close`).send({ version: 1 })).status).toBe(404);
    expect((await outsider.post(`/api/tasks/${task.id}/start`).send({})).status).toBe(404);
    expect((await outsider.get(`/api/tasks/${task.id}`)).status).toBe(404);
    expect((await outsider.get(`/api/bikes/${w.bikeA.id}`)).status).toBe(404);
    expect((await outsider.post(`/api/bikes/${w.bikeA.id}/status`).send({ status: 'retired' })).status).toBe(404);
    const insider = await agent(t.app);
    await insider.login(w.people.technician.email, PASSWORD);
    expect((await insider.post(`/api/tasks/${task.id}/start`).send({})).status).toBe(200);
  });
});
