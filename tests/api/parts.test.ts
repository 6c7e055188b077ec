import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq, sql } from 'drizzle-orm';
import { agent, manualClock, testApp, type Agent, type TestContext } from '../support/test-app';
import { PASSWORD, makeServiceItem, world } from '../support/factories';
import { dueStates, odometerReadings, partStock, parts, serviceItemParts, serviceTasks, stockMovements, suppliers } from '../../server/db/schema';
import type { Forecast, StockView } from '../../shared/schemas/parts';

// Thursday 3 December 2026, 09:00 in London.
const clock = manualClock('2026-12-03T09:00:00Z');

let ctx: TestContext;
let w: Awaited<ReturnType<typeof world>>;
let manager: Agent;
let tech: Agent;
let techB: Agent;
let oilId: string;
let filterId: string;

beforeAll(async () => {
  ctx = await testApp({ now: clock.now });
  const db = ctx.database.db;
  w = await world(db);
  const login = async (email: string) => {
    const a = await agent(ctx.app);
    await a.login(email, PASSWORD);
    return a;
  };
  manager = await login(w.people.manager.email);
  tech = await login(w.people.technician.email);
  techB = await login(w.people.technicianB.email);
  const [supplier] = await db.insert(suppliers).values({ name: 'Harbour Lubricants', email: 'orders@harbour-lubricants.test' }).returning();
  const [oil] = await db.insert(parts).values({ partNumber: 'OIL-1040', name: 'Engine oil 10W-40', family: 'oil', unit: 'litre', packSize: 4, supplierId: supplier.id, leadTimeDays: 5 }).returning();
  const [filter] = await db.insert(parts).values({ partNumber: 'FLT-125', name: 'Oil filter', family: 'filter', unit: 'each', packSize: 10, supplierId: supplier.id, leadTimeDays: 10 }).returning();
  oilId = oil.id;
  filterId = filter.id;
});
afterAll(() => ctx.close());

const stock = async (a: Agent, site: string) => (await a.get(`/api/stock?site=${site}`)).body as StockView;
const lineOf = (v: StockView, partId: string) => v.items.find((i) => i.partId === partId)!;

describe('the stock ledger', () => {
  it('books a delivery, a use and a stock-take, and on hand is the sum of the ledger', async () => {
    const site = w.siteA.id;
    let res = await tech.post('/api/stock/movements').send({ siteId: site, partId: oilId, kind: 'received', quantity: 20, unit: 'litre' });
    expect(res.status).toBe(201);
    res = await tech.post('/api/stock/movements').send({ siteId: site, partId: oilId, kind: 'used', quantity: 1.1, unit: 'litre', note: 'top-up' });
    expect(lineOf(res.body, oilId).onHand).toBe(18.9);
    res = await tech.post('/api/stock/movements').send({ siteId: site, partId: oilId, kind: 'stock-take', quantity: 18.5, unit: 'litre', note: 'shelf count' });
    expect(lineOf(res.body, oilId).onHand).toBe(18.5);
    const [sum] = await ctx.database.db
      .select({ total: sql<number>`sum(${stockMovements.delta})`.mapWith(Number) })
      .from(stockMovements)
      .where(and(eq(stockMovements.siteId, site), eq(stockMovements.partId, oilId)));
    expect(Math.round(sum.total * 1000) / 1000).toBe(18.5);
    expect((await stock(tech, site)).recent.map((m) => m.kind).slice(0, 3)).toEqual(['stock-take', 'used', 'received']);
  });

  it('refuses a negative quantity, another unit and more out than is on hand, in words, writing nothing', async () => {
    const site = w.siteA.id;
    const before = await ctx.database.db.select().from(stockMovements);
    const bad = [
      { body: { siteId: site, partId: oilId, kind: 'received', quantity: -2, unit: 'litre' }, says: /cannot be negative/ },
      { body: { siteId: site, partId: oilId, kind: 'used', quantity: 1, unit: 'each' }, says: /counted in litres, not pieces/ },
      { body: { siteId: site, partId: oilId, kind: 'used', quantity: 500, unit: 'litre' }, says: /Only 18.5 L/ },
      { body: { siteId: site, partId: filterId, kind: 'received', quantity: 1.5, unit: 'each' }, says: /whole pieces/ },
      { body: { siteId: site, partId: oilId, kind: 'transfer-out', quantity: 1, unit: 'litre' }, says: /other site/ },
      { body: { siteId: site, partId: oilId, kind: 'received', quantity: 'lots', unit: 'litre' }, says: /number/ },
    ];
    for (const b of bad) {
      const res = await tech.post('/api/stock/movements').send(b.body);
      expect(res.status, JSON.stringify(b.body)).toBe(400);
      expect(JSON.stringify(res.body)).toMatch(b.says);
    }
    expect(await ctx.database.db.select().from(stockMovements)).toHaveLength(before.length);
  });

  it('moves stock between two sites in one go, and keeps a technician to their own site', async () => {
    const res = await manager.post('/api/stock/movements').send({ siteId: w.siteA.id, partId: oilId, kind: 'transfer-out', quantity: 4, unit: 'litre', otherSiteId: w.siteB.id });
    expect(res.status).toBe(201);
    expect(lineOf(res.body, oilId).onHand).toBe(14.5);
    expect(lineOf(await stock(manager, w.siteB.id), oilId).onHand).toBe(4);
    expect((await tech.get(`/api/stock?site=${w.siteB.id}`)).status).toBe(404);
    expect((await techB.post('/api/stock/movements').send({ siteId: w.siteA.id, partId: oilId, kind: 'used', quantity: 1, unit: 'litre' })).status).toBe(404);
    const [row] = await ctx.database.db.select().from(partStock).where(and(eq(partStock.siteId, w.siteB.id), eq(partStock.partId, oilId)));
    expect(row.onHand).toBe(4);
  });
});

describe('the forecast', () => {
  it('counts the parts of the services each bike will come due for, with P50 ≤ P90 and a suggested order in packs', async () => {
    const db = ctx.database.db;
    const item = await makeServiceItem(db, w.model.id, { name: 'Oil change', category: 'oil', everyKm: 1000, everyMonths: 6 });
    await db.insert(serviceItemParts).values([
      { serviceItemId: item.id, partId: oilId, quantity: 1.2, share: 1 },
      { serviceItemId: item.id, partId: filterId, quantity: 1, share: 1 },
    ]);
    // The bike rides about 100 km a day; its oil falls due 250 km from now.
    const days = Array.from({ length: 30 }, (_, i) => ({ bikeId: w.bikeA.id, date: `2026-11-${String(i + 1).padStart(2, '0')}`, value: 2000 + 100 * i, unit: 'km' as const, odometerKm: 2000 + 100 * i }));
    await db.insert(odometerReadings).values(days);
    await db.insert(dueStates).values({
      bikeId: w.bikeA.id, serviceItemId: item.id, status: 'ok', dueAtKm: 5150, dueByDate: '2027-05-01', currentKm: 4900, baselineDate: '2026-11-01', baselineKm: 4150,
    });
    const res = await manager.get(`/api/forecast?site=${w.siteA.id}&weeks=4`);
    expect(res.status).toBe(200);
    const f = res.body as Forecast;
    expect(f.today).toBe('2026-12-03');
    const oil = f.parts.find((p) => p.partId === oilId)!;
    expect(oil.weeks.map((w2) => w2.weekStart)).toEqual(['2026-11-30', '2026-12-07', '2026-12-14', '2026-12-21']);
    // Due in 2–3 days, then every ~10 days: 3 services in the four weeks (1.2 L each).
    expect(oil.weeks[0].p50).toBe(1.2);
    expect(oil.weeks.at(-1)!.cumulativeP50).toBeCloseTo(3.6, 3);
    for (const wk of oil.weeks) expect(wk.p90).toBeGreaterThanOrEqual(wk.p50);
    const filter = f.parts.find((p) => p.partId === filterId)!;
    // No filters on the shelf: it runs out this week, before a 10-day delivery could arrive.
    expect(filter.onHand).toBe(0);
    expect(filter.runsOutWeek).toBe('2026-11-30');
    expect(filter.shortBeforeDelivery).toBe(true);
    // Suggested: the cautious need over 10 days (1 or 2 filters) in whole packs of 10.
    expect(filter.suggested.quantity % 10).toBe(0);
    expect(filter.suggested.packs).toBe(1);
    // Oil: 14.5 L on hand covers the lead time: nothing to order, no shortage.
    expect(oil.suggested.quantity).toBe(0);
    expect(oil.runsOutWeek).toBeNull();
  });

  it('answers from its kept simulation only while nothing it reads has changed', async () => {
    const db = ctx.database.db;
    const oilWeek = async () => ((await manager.get(`/api/forecast?site=${w.siteA.id}&weeks=4`)).body as Forecast).parts.find((p) => p.partId === oilId)!;
    const before = await oilWeek();
    expect((await oilWeek()).weeks).toEqual(before.weeks);
    // The parts a service uses change (written straight to the database, outside the app): seen at once.
    const [use] = await db.select().from(serviceItemParts).where(eq(serviceItemParts.partId, oilId));
    await db.update(serviceItemParts).set({ quantity: 2.4 }).where(eq(serviceItemParts.serviceItemId, use.serviceItemId));
    const doubled = await oilWeek();
    expect(doubled.weeks.at(-1)!.cumulativeP50).toBeCloseTo(2 * before.weeks.at(-1)!.cumulativeP50, 3);
    // The shelf is read fresh: a delivery moves on hand without any change to the simulation.
    await tech.post('/api/stock/movements').send({ siteId: w.siteA.id, partId: oilId, kind: 'received', quantity: 4, unit: 'litre' });
    expect((await oilWeek()).onHand).toBe(before.onHand + 4);
    // A reading that changes the bike's riding moves the fleet version: the simulation is worked out again.
    await db.delete(odometerReadings).where(eq(odometerReadings.bikeId, w.bikeA.id));
    expect((await oilWeek()).weeks.at(-1)!.cumulativeP50).toBeLessThan(doubled.weeks.at(-1)!.cumulativeP50);
    await db.update(serviceItemParts).set({ quantity: use.quantity }).where(eq(serviceItemParts.serviceItemId, use.serviceItemId));
    await db.insert(odometerReadings).values(Array.from({ length: 30 }, (_, i) => ({ bikeId: w.bikeA.id, date: `2026-11-${String(i + 1).padStart(2, '0')}`, value: 2000 + 100 * i, unit: 'km' as const, odometerKm: 2000 + 100 * i })));
    await tech.post('/api/stock/movements').send({ siteId: w.siteA.id, partId: oilId, kind: 'used', quantity: 4, unit: 'litre', note: 'put back as it was' });
  });

  it('refuses a site the caller does not work at and weeks out of range, in words', async () => {
    expect((await tech.get(`/api/forecast?site=${w.siteB.id}`)).status).toBe(404);
    const res = await manager.get(`/api/forecast?site=${w.siteA.id}&weeks=99`);
    expect(res.status).toBe(400);
    expect(JSON.stringify(res.body)).toMatch(/At most 26 weeks/);
  });
});

describe('closing a task uses its parts', () => {
  it('offers the usual parts on the card, books what was typed as used on the task, and refuses more than the shelf holds, writing nothing', async () => {
    const db = ctx.database.db;
    const item = await makeServiceItem(db, w.model.id, { name: 'Oil and filter', category: 'oil', everyKm: 3000, everyMonths: 6 });
    await db.insert(serviceItemParts).values([
      { serviceItemId: item.id, partId: oilId, quantity: 1.2, share: 1 },
      // Only now and then: offered at zero.
      { serviceItemId: item.id, partId: filterId, quantity: 1, share: 0.5 },
    ]);
    const [task] = await db.insert(serviceTasks).values({ bikeId: w.bikeA.id, serviceItemId: item.id, cycleKey: 'parts-used' }).returning();
    const card = await tech.get(`/api/tasks/${task.id}`);
    expect(card.status).toBe(200);
    const oilOnHand = lineOf(await stock(tech, w.siteA.id), oilId).onHand;
    expect(card.body.parts).toEqual([
      expect.objectContaining({ partId: oilId, usual: 1.2, share: 1, suggested: 1.2, onHand: oilOnHand, unit: 'litre' }),
      expect.objectContaining({ partId: filterId, usual: 1, share: 0.5, suggested: 0, onHand: 0, unit: 'each' }),
    ]);
    // A filter the shelf does not have: the whole sign-off is refused in words, the task stays open, nothing is booked.
    const movements = (await db.select().from(stockMovements)).length;
    const refused = await tech.post(`/api/tasks/${task.id}/close`).send({ version: task.version, parts: [{ partId: oilId, quantity: 1.1, unit: 'litre' }, { partId: filterId, quantity: 1, unit: 'each' }] });
    expect(refused.status).toBe(400);
    expect(refused.body.error.message).toMatch(/Oil filter/);
    expect(refused.body.error.message).toMatch(/stock-take/);
    expect((await db.select().from(stockMovements)).length).toBe(movements);
    expect((await tech.get(`/api/tasks/${task.id}`)).body.task.status).toBe('open');
    // As the technician corrects it: 1.1 L of oil, no filter.
    const closed = await tech.post(`/api/tasks/${task.id}/close`).send({ version: task.version, parts: [{ partId: oilId, quantity: 1.1, unit: 'litre' }, { partId: filterId, quantity: 0, unit: 'each' }] });
    expect(closed.status).toBe(200);
    expect(lineOf(await stock(tech, w.siteA.id), oilId).onHand).toBe(Math.round((oilOnHand - 1.1) * 1000) / 1000);
    const booked = await db.select().from(stockMovements).where(eq(stockMovements.taskId, task.id));
    expect(booked).toHaveLength(1);
    expect(booked[0]).toMatchObject({ kind: 'used', delta: -1.1, partId: oilId, siteId: w.siteA.id });
    expect(booked[0].reason).toMatch(/^Used on T-\d+, Oil and filter$/);
  });
});
