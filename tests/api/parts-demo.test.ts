import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { agent, manualClock, testApp, type Agent, type TestContext } from '../support/test-app';
import { seedDemo } from '../../server/demo/seed';
import type { Forecast, PurchaseOrder, Shortage, StockView } from '../../shared/schemas/parts';

// The demo as a parts person meets it on a Friday morning in December.
const clock = manualClock('2026-12-04T09:00:00Z');
const PASSWORD = 'demo-password-for-tests';
let ctx: TestContext;
let manager: Agent;
let quay: string;
let airfield: string;

beforeAll(async () => {
  ctx = await testApp({ now: clock.now });
  await seedDemo(ctx.database.db, { password: PASSWORD, today: '2026-12-04' });
  const admin = await agent(ctx.app);
  await admin.login('ada@saltmarsh.test', PASSWORD);
  expect((await admin.post('/api/admin/jobs/due-scan/run')).status).toBe(200);
  await ctx.settled();
  manager = await agent(ctx.app);
  await manager.login('imogen@saltmarsh.test', PASSWORD);
  const sites = (await manager.get('/api/sites')).body.items as { id: string; name: string }[];
  quay = sites.find((s) => s.name === 'Quay Street')!.id;
  airfield = sites.find((s) => s.name === 'Airfield')!.id;
}, 120_000);
afterAll(() => ctx.close());

describe('the demo’s parts shelf', () => {
  it('has stock at both sites, the ledger adding up to the shelf', async () => {
    for (const site of [quay, airfield]) {
      const v = (await manager.get(`/api/stock?site=${site}`)).body as StockView;
      expect(v.items.length).toBeGreaterThanOrEqual(12);
      expect(v.items.some((i) => i.onHand > 0)).toBe(true);
      expect(v.recent.length).toBeGreaterThan(0);
    }
  });

  it('forecasts a part at Quay Street that runs out before an order could arrive, and holds a draft order for it', async () => {
    const f = (await manager.get(`/api/forecast?site=${quay}&weeks=8`)).body as Forecast;
    const short = f.parts.filter((p) => p.shortBeforeDelivery);
    expect(short.length).toBeGreaterThanOrEqual(1);
    const orders = (await manager.get(`/api/purchase-orders?site=${quay}&status=draft`)).body.items as PurchaseOrder[];
    const drafted = new Set(orders.flatMap((o) => o.lines.map((l) => l.partId)));
    expect(short.some((p) => drafted.has(p.partId))).toBe(true);
  });

  it('puts that part on the week board’s shortage list, with the draft that holds it', async () => {
    const res = await manager.get('/api/stock/shortages');
    expect(res.status).toBe(200);
    const filters = (res.body.items as Shortage[]).find((s) => s.siteId === quay && s.name === 'Oil filter, 250–400 cc');
    expect(filters).toMatchObject({ siteName: 'Quay Street', onHand: 0, leadTimeDays: 7 });
    expect(filters!.orders).toEqual([expect.objectContaining({ number: 1, status: 'draft' })]);
  });
});
