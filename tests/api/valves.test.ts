import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { agent, manualClock, testApp, type Agent, type TestContext } from '../support/test-app';
import { PASSWORD, makeBike, makeServiceItem, world } from '../support/factories';
import { odometerReadings, serviceRecords, serviceTasks, shimStock, valveChecks, valveReadings } from '../../server/db/schema';
import { valveLayout } from '../../shared/domain/valves';
import { toModelSummary } from '../../server/services/models';
import { valveWarningsFor, valveWarningsForScan } from '../../server/services/valve-warnings';
import { loadDueInputs } from '../../server/services/due-data';

const clock = manualClock('2026-06-15T09:00:00Z');
let t: TestContext;
let w: Awaited<ReturnType<typeof world>>;
const as: Record<string, Agent> = {};
let itemId: string;

beforeAll(async () => {
  t = await testApp({ now: clock.now });
  w = await world(t.database.db);
  itemId = (await makeServiceItem(t.database.db, w.model.id, { name: 'Valve clearance', category: 'valves', everyKm: 24000, everyMonths: 24, estimatedMinutes: 150 })).id;
  await t.database.db.insert(shimStock).values([
    { siteId: w.siteA.id, sizeUm: 2500, condition: 'new', count: 1, minCount: 1 },
    { siteId: w.siteA.id, sizeUm: 2450, condition: 'new', count: 0, minCount: 2 },
  ]);
  for (const role of ['manager', 'technician', 'technicianB'] as const) {
    as[role] = await agent(t.app);
    await as[role].login(w.people[role].email, PASSWORD);
  }
});
afterAll(() => t.close());

async function valveTask(fleetNumber: string) {
  const bike = await makeBike(t.database.db, w.model.id, w.siteA.id, { fleetNumber, inServiceDate: '2025-01-01' });
  await t.database.db.insert(odometerReadings).values({ bikeId: bike.id, date: '2026-06-14', value: 24100, unit: 'km', odometerKm: 24100 });
  const [task] = await t.database.db
    .insert(serviceTasks)
    .values({ bikeId: bike.id, serviceItemId: itemId, cycleKey: `test:${fleetNumber}`, assigneeId: w.people.technician.id })
    .returning();
  return { bike, task };
}

const layout = () => valveLayout(toModelSummary(w.model));
/** Every valve in spec as found (intake 0.15, exhaust 0.25 mm), shim read off 2.60 mm. */
const inSpec = () =>
  layout().map((v) => ({ valveId: v.valveId, asFound: { method: 'direct' as const, mm: v.side === 'intake' ? 0.15 : 0.25 }, shimBeforeMm: 2.6 }));

describe('the valve task card', () => {
  it('lists one row per valve with its cold spec, the shim series and the site’s stock', async () => {
    const { task } = await valveTask('V-CARD');
    const res = await as.technician.get(`/api/tasks/${task.id}/valve-card`);
    expect(res.status).toBe(200);
    expect(res.body.valves).toHaveLength(8);
    expect(res.body.valves.find((v: { valveId: string }) => v.valveId === 'c2-exhaust-1')).toMatchObject({ specMinMm: 0.2, specMaxMm: 0.3 });
    // 1.20–3.50 mm in 0.05 mm steps: 47 sizes (trade series, common practice).
    expect(res.body.shimSizesMm).toHaveLength(47);
    expect(res.body.stock.length).toBeGreaterThan(0);
    expect((await as.technicianB.get(`/api/tasks/${task.id}/valve-card`)).status).toBe(404);
  });

  it('keeps a draft on the server so another tablet can carry on', async () => {
    const { task } = await valveTask('V-DRAFT');
    const draft = { readings: [{ valveId: 'c1-intake-1', asFound: { method: 'feeler', slidesMm: 0.15, stopsMm: 0.2 } }] };
    expect((await as.technician.put(`/api/tasks/${task.id}/draft`).send(draft)).status).toBe(204);
    expect((await as.technician.get(`/api/tasks/${task.id}/valve-card`)).body.draft).toEqual(draft);
  });
});

describe('signing off a valve task', () => {
  it('needs an as-found reading for every valve, and writes nothing otherwise', async () => {
    const { bike, task } = await valveTask('V-MISSING');
    const res = await as.technician.post(`/api/tasks/${task.id}/valve-close`).send({ version: task.version, readings: inSpec().slice(1) });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toContain('Cylinder 1 intake 1');
    expect(await t.database.db.select().from(serviceRecords).where(eq(serviceRecords.bikeId, bike.id))).toHaveLength(0);
    expect(await t.database.db.select().from(valveChecks).where(eq(valveChecks.bikeId, bike.id))).toHaveLength(0);
  });

  it('blocks a valve left outside its spec unless a manager overrides with a reason', async () => {
    const { task } = await valveTask('V-OVERRIDE');
    const readings = inSpec().map((r) => (r.valveId === 'c2-exhaust-2' ? { ...r, asFound: { method: 'direct' as const, mm: 0.18 } } : r));
    const blocked = await as.technician.post(`/api/tasks/${task.id}/valve-close`).send({ version: task.version, readings });
    expect(blocked.status).toBe(409);
    expect(blocked.body.error.details[0].path).toBe('readings.c2-exhaust-2.asLeftMm');
    const byTech = await as.technician.post(`/api/tasks/${task.id}/valve-close`).send({ version: task.version, readings, override: { reason: 'Shim on order, bike stays in the workshop' } });
    expect(byTech.status).toBe(403);
    const byManager = await as.manager.post(`/api/tasks/${task.id}/valve-close`).send({ version: task.version, readings, override: { reason: 'Shim on order, bike stays in the workshop' } });
    expect(byManager.status).toBe(200);
  });

  it('records the readings, the service, and moves shim stock: removed shim back as used, fitted one out', async () => {
    const { bike, task } = await valveTask('V-RESHIM');
    // Exhaust 0.15 mm on a 2.60 mm shim, target 0.25: new shim = 2.60 + 0.15 − 0.25 = 2.50 mm (common practice: N = T + (A − V)).
    const readings = inSpec().map((r) => (r.valveId === 'c2-exhaust-1' ? { ...r, asFound: { method: 'feeler' as const, slidesMm: 0.15, stopsMm: 0.2 }, shimAfterMm: 2.5, asLeftMm: 0.25 } : r));
    const res = await as.technician.post(`/api/tasks/${task.id}/valve-close`).send({ version: task.version, readings });
    expect(res.status).toBe(200);
    expect(res.body.task.status).toBe('done');
    const [check] = await t.database.db.select().from(valveChecks).where(eq(valveChecks.bikeId, bike.id));
    const rows = await t.database.db.select().from(valveReadings).where(eq(valveReadings.checkId, check.id));
    expect(rows).toHaveLength(8);
    expect(rows.find((r) => r.cylinder === 2 && r.side === 'exhaust' && r.position === 1)).toMatchObject({ asFoundUm: 150, asLeftUm: 250, shimBeforeUm: 2600, shimAfterUm: 2500, method: 'feeler' });
    const stock = await t.database.db.select().from(shimStock).where(eq(shimStock.siteId, w.siteA.id));
    expect(stock.find((s) => s.sizeUm === 2600 && s.condition === 'used')?.count).toBe(1);
    expect(stock.find((s) => s.sizeUm === 2500 && s.condition === 'new')?.count).toBe(0);
    const [record] = await t.database.db.select().from(serviceRecords).where(and(eq(serviceRecords.bikeId, bike.id), eq(serviceRecords.serviceItemId, itemId)));
    expect(record).toMatchObject({ date: '2026-06-15', odometerKm: 24100, taskId: task.id });
  });

  it('lets one of two technicians closing the same task win; the other gets 409', async () => {
    const { task } = await valveTask('V-RACE');
    const body = { version: task.version, readings: inSpec() };
    const [a, b] = await Promise.all([
      as.technician.post(`/api/tasks/${task.id}/valve-close`).send(body),
      as.manager.post(`/api/tasks/${task.id}/valve-close`).send(body),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 409]);
  });
});

describe('clearance trends and stock', () => {
  it('warns about a valve that closes up before its next check and raises an early check in the scan', async () => {
    const bike = await makeBike(t.database.db, w.model.id, w.siteA.id, { fleetNumber: 'V-TREND', inServiceDate: '2023-01-01' });
    await t.database.db.insert(odometerReadings).values({ bikeId: bike.id, date: '2026-06-14', value: 41000, unit: 'km', odometerKm: 41000 });
    // 0.28 → 0.24 → 0.21 mm at 1,000, 20,000 and 40,000 km, never adjusted (the demo's closing exhaust).
    for (const [km, um, date] of [[1000, 280, '2023-02-01'], [20000, 240, '2024-06-01'], [40000, 210, '2026-05-01']] as const) {
      const [c] = await t.database.db.insert(valveChecks).values({ bikeId: bike.id, date, odometerKm: km }).returning();
      await t.database.db.insert(serviceRecords).values({ bikeId: bike.id, serviceItemId: itemId, date, odometerKm: km });
      await t.database.db.insert(valveReadings).values(
        layout().map((v) => ({ checkId: c.id, cylinder: v.cylinder, side: v.side, position: v.position, asFoundUm: v.valveId === 'c2-exhaust-1' ? um : v.side === 'intake' ? 150 : 250 })),
      );
    }
    const scan = await as.manager.get('/api/due?within=30');
    expect(scan.status).toBe(200);
    const admin = await agent(t.app);
    await admin.login(w.people.admin.email, PASSWORD);
    const run = await admin.post('/api/admin/jobs/due-scan/run');
    expect(run.body.result.valveWarnings).toBeGreaterThanOrEqual(1);
    const valves = await as.manager.get(`/api/bikes/${bike.id}/valves`);
    const ex = valves.body.valves.find((v: { valveId: string }) => v.valveId === 'c2-exhaust-1');
    expect(ex.tightening).toBe(true);
    expect(ex.warning).toBe(true);
    expect(ex.kmAtSpecMin).toBeLessThan(ex.nextCheckKm);
    const early = await t.database.db.select().from(serviceTasks).where(and(eq(serviceTasks.bikeId, bike.id), eq(serviceTasks.origin, 'trend')));
    expect(early).toHaveLength(1);
    const warnings = await as.manager.get('/api/valves/warnings');
    expect(warnings.body.items.some((x: { fleetNumber: string }) => x.fleetNumber === 'V-TREND')).toBe(true);
    // The scan works its warnings out from the inputs it has just read: the same as the screens'.
    const fromScan = await valveWarningsForScan(t.database.db, await loadDueInputs(t.database.db, clock.now()));
    expect(fromScan.some((x) => x.fleetNumber === 'V-TREND')).toBe(true);
    expect(fromScan).toEqual(await valveWarningsFor(t.database.db, [w.siteA.id, w.siteB.id]));
  });

  it('adjusts stock with a reason and builds a reorder list from sizes below their minimum', async () => {
    const adj = await as.technician.post('/api/stock/shims/adjust').send({ siteId: w.siteA.id, sizeMm: 2.45, condition: 'new', delta: 1, reason: 'delivery' });
    expect(adj.status).toBe(200);
    const noReason = await as.technician.post('/api/stock/shims/adjust').send({ siteId: w.siteA.id, sizeMm: 2.45, condition: 'new', delta: 1, reason: '' });
    expect(noReason.status).toBe(400);
    const other = await as.technicianB.post('/api/stock/shims/adjust').send({ siteId: w.siteA.id, sizeMm: 2.45, condition: 'new', delta: 1, reason: 'delivery' });
    expect(other.status).toBe(403);
    const reorder = await as.technician.get(`/api/stock/shims/reorder?siteId=${w.siteA.id}`);
    expect(reorder.body.items.find((l: { sizeMm: number }) => l.sizeMm === 2.45)).toMatchObject({ need: 1 });
  });
});
