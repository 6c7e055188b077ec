import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq, sql } from 'drizzle-orm';
import { simpleParser } from 'mailparser';
import Papa from 'papaparse';
import { agent, manualClock, testApp, type Agent, type TestContext } from '../support/test-app';
import { PASSWORD, world } from '../support/factories';
import { partStock, parts, purchaseOrderLines, purchaseOrders, stockMovements, suppliers } from '../../server/db/schema';
import type { PurchaseOrder, StockView } from '../../shared/schemas/parts';

// Thursday 3 December 2026, 09:00 in London.
const clock = manualClock('2026-12-03T09:00:00Z');

let ctx: TestContext;
let w: Awaited<ReturnType<typeof world>>;
let manager: Agent;
let tech: Agent;
let techB: Agent;
let admin: Agent;
let supplierId: string;
let otherSupplierId: string;
let padsId: string;
let oilId: string;
let tyreId: string;

beforeAll(async () => {
  ctx = await testApp({ now: clock.now, withMail: true });
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
  admin = await login(w.people.admin.email);
  const [s1, s2] = await db
    .insert(suppliers)
    .values([
      { name: 'Dyke End Components', email: 'trade@dyke-end.test' },
      { name: 'Harbour Lubricants', email: 'orders@harbour-lubricants.test' },
    ])
    .returning();
  supplierId = s1.id;
  otherSupplierId = s2.id;
  const [pads, tyre, oil] = await db
    .insert(parts)
    .values([
      // A comma in the name: the CSV must quote the field (RFC 4180 §2.6).
      { partNumber: 'PAD-R-12', name: 'Rear brake pads, scooter', family: 'brakes', unit: 'set', packSize: 2, supplierId, leadTimeDays: 12, unitCostPence: 1600 },
      { partNumber: 'TYR-R-12', name: 'Rear tyre 120/70-12', family: 'tyres', unit: 'each', packSize: 1, supplierId, leadTimeDays: 5, unitCostPence: 4500 },
      { partNumber: 'OIL-1040', name: 'Engine oil 10W-40', family: 'oil', unit: 'litre', packSize: 4, supplierId: otherSupplierId, leadTimeDays: 3, unitCostPence: 890 },
    ])
    .returning();
  padsId = pads.id;
  tyreId = tyre.id;
  oilId = oil.id;
});
afterAll(() => ctx.close());

const onHand = async (partId: string, site = w.siteA.id) => ((await manager.get(`/api/stock?site=${site}`)).body as StockView).items.find((i) => i.partId === partId)!;

describe('purchase orders', () => {
  let order: PurchaseOrder;

  it('drafts an order with one supplier’s parts, numbered, and refuses a part of another supplier in words', async () => {
    const res = await manager.post('/api/purchase-orders').send({ siteId: w.siteA.id, supplierId, lines: [{ partId: padsId, quantity: 4 }, { partId: tyreId, quantity: 2 }], note: 'Before the spring hires' });
    expect(res.status).toBe(201);
    order = res.body.order;
    expect(order).toMatchObject({ status: 'draft', siteId: w.siteA.id, supplier: { id: supplierId }, sentAt: null });
    expect(order.number).toBeGreaterThan(0);
    expect(order.lines.map((l) => [l.partNumber, l.quantity, l.received])).toEqual([['PAD-R-12', 4, 0], ['TYR-R-12', 2, 0]]);
    const mixed = await manager.post('/api/purchase-orders').send({ siteId: w.siteA.id, supplierId, lines: [{ partId: oilId, quantity: 4 }] });
    expect(mixed.status).toBe(400);
    expect(mixed.body.error.message).toMatch(/Engine oil 10W-40 does not come from this supplier/);
    const twice = await manager.post('/api/purchase-orders').send({ siteId: w.siteA.id, supplierId, lines: [{ partId: padsId, quantity: 1 }, { partId: padsId, quantity: 2 }] });
    expect(twice.status).toBe(400);
    expect(JSON.stringify(twice.body)).toMatch(/listed twice/);
    const negative = await manager.post('/api/purchase-orders').send({ siteId: w.siteA.id, supplierId, lines: [{ partId: padsId, quantity: -1 }] });
    expect(negative.status).toBe(400);
    expect(JSON.stringify(negative.body)).toMatch(/above zero/);
    // Drafts are not yet on order.
    expect((await onHand(padsId)).onOrder).toBe(0);
    expect((await tech.post('/api/purchase-orders').send({ siteId: w.siteA.id, supplierId, lines: [{ partId: padsId, quantity: 1 }] })).status).toBe(403);
  });

  it('refuses to book a receipt on a draft: it has not been sent', async () => {
    const before = await ctx.database.db.select().from(stockMovements);
    const res = await tech.post(`/api/purchase-orders/${order.id}/receive`).send({ lines: [{ partId: padsId, quantity: 4 }] });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/not been sent yet/);
    expect(await ctx.database.db.select().from(stockMovements)).toHaveLength(before.length);
  });

  it('sends the order to the supplier by e-mail with the CSV of its lines (RFC 5322 read by mailparser, CSV by RFC 4180)', async () => {
    const res = await manager.post(`/api/purchase-orders/${order.id}/send`);
    expect(res.status).toBe(200);
    expect(res.body.order.status).toBe('sent');
    expect((await manager.post(`/api/purchase-orders/${order.id}/send`)).status).toBe(409);
    expect((await onHand(padsId)).onOrder).toBe(4);
    const run = await admin.post('/api/admin/jobs/deliver-mail/run');
    expect(run.status).toBe(200);
    const list = await admin.get('/api/admin/mail');
    const mail = list.body.items.find((m: { to: string }) => m.to === 'trade@dyke-end.test');
    expect(mail).toBeDefined();
    const raw = await admin.get(`/api/admin/mail/${mail.id}/raw`);
    const parsed = await simpleParser(raw.text);
    const label = `PO-${String(order.number).padStart(4, '0')}`;
    expect(parsed.subject).toContain(label);
    expect(parsed.text).toContain('Before the spring hires');
    expect(parsed.attachments).toHaveLength(1);
    const csvFile = parsed.attachments[0];
    expect(csvFile.filename).toBe(`${label}.csv`);
    expect(csvFile.contentType).toBe('text/csv');
    const csv = csvFile.content.toString('utf8');
    // RFC 4180 §2.1: each record ends in CRLF; §2.3: a header line; §2.6: a field with a comma is quoted.
    expect(csv.endsWith('\r\n')).toBe(true);
    expect(csv.split('\r\n')[0]).toBe('line,part_number,description,quantity,unit,pack_size,packs,unit_cost_gbp,line_total_gbp');
    expect(csv).toContain('"Rear brake pads, scooter"');
    const rows = Papa.parse<Record<string, string>>(csv.trim(), { header: true }).data;
    expect(rows).toEqual([
      { line: '1', part_number: 'PAD-R-12', description: 'Rear brake pads, scooter', quantity: '4', unit: 'set', pack_size: '2', packs: '2', unit_cost_gbp: '16.00', line_total_gbp: '64.00' },
      { line: '2', part_number: 'TYR-R-12', description: 'Rear tyre 120/70-12', quantity: '2', unit: 'each', pack_size: '1', packs: '2', unit_cost_gbp: '45.00', line_total_gbp: '90.00' },
    ]);
  });

  it('books a part delivery into stock by exactly what arrived, then the rest, and refuses more than ordered', async () => {
    const padsBefore = (await onHand(padsId)).onHand;
    let res = await tech.post(`/api/purchase-orders/${order.id}/receive`).send({ lines: [{ partId: padsId, quantity: 3 }, { partId: tyreId, quantity: 0 }], note: 'one set short' });
    expect(res.status).toBe(200);
    expect(res.body.order.status).toBe('part-received');
    expect((await onHand(padsId)).onHand).toBe(padsBefore + 3);
    expect((await onHand(padsId)).onOrder).toBe(1);
    // More than is still due: refused in words, nothing written.
    const movements = await ctx.database.db.select().from(stockMovements);
    res = await tech.post(`/api/purchase-orders/${order.id}/receive`).send({ lines: [{ partId: padsId, quantity: 2 }, { partId: tyreId, quantity: 2 }] });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/only 1 is still due/);
    expect(await ctx.database.db.select().from(stockMovements)).toHaveLength(movements.length);
    expect((await onHand(tyreId)).onHand).toBe(0);
    // Half a tyre: the unit is whole pieces; nothing written, the pads line included.
    res = await tech.post(`/api/purchase-orders/${order.id}/receive`).send({ lines: [{ partId: padsId, quantity: 1 }, { partId: tyreId, quantity: 1.5 }] });
    expect(res.status).toBe(400);
    expect(await ctx.database.db.select().from(stockMovements)).toHaveLength(movements.length);
    // Another site's technician cannot see it.
    expect((await techB.post(`/api/purchase-orders/${order.id}/receive`).send({ lines: [{ partId: padsId, quantity: 1 }] })).status).toBe(404);
    res = await tech.post(`/api/purchase-orders/${order.id}/receive`).send({ lines: [{ partId: padsId, quantity: 1 }, { partId: tyreId, quantity: 2 }] });
    expect(res.status).toBe(200);
    expect(res.body.order.status).toBe('received');
    expect(res.body.order.receivedAt).toBe(clock.now().toISOString());
    expect((await onHand(padsId)).onHand).toBe(padsBefore + 4);
    expect((await onHand(tyreId)).onHand).toBe(2);
    expect((await onHand(padsId)).onOrder).toBe(0);
    // The ledger rows name the order; their sum is what is on hand.
    const booked = await ctx.database.db.select().from(stockMovements).where(eq(stockMovements.purchaseOrderId, order.id));
    expect(booked.map((m) => m.delta).sort()).toEqual([1, 2, 3]);
    const [{ total }] = await ctx.database.db
      .select({ total: sql<number>`sum(${stockMovements.delta})`.mapWith(Number) })
      .from(stockMovements)
      .where(and(eq(stockMovements.siteId, w.siteA.id), eq(stockMovements.partId, padsId)));
    const [row] = await ctx.database.db.select().from(partStock).where(and(eq(partStock.siteId, w.siteA.id), eq(partStock.partId, padsId)));
    expect(total).toBe(row.onHand);
    expect((await tech.post(`/api/purchase-orders/${order.id}/receive`).send({ lines: [{ partId: padsId, quantity: 1 }] })).status).toBe(409);
    expect((await manager.post(`/api/purchase-orders/${order.id}/cancel`)).status).toBe(409);
  });

  it('lists a site’s orders, newest first, filtered by state, and keeps other sites’ staff out', async () => {
    const draft = await manager.post('/api/purchase-orders').send({ siteId: w.siteA.id, supplierId: otherSupplierId, lines: [{ partId: oilId, quantity: 8 }] });
    const cancelled = await manager.post(`/api/purchase-orders/${draft.body.order.id}/cancel`);
    expect(cancelled.body.order.status).toBe('cancelled');
    const all = await tech.get(`/api/purchase-orders?site=${w.siteA.id}`);
    expect(all.status).toBe(200);
    expect(all.body.items.map((o: PurchaseOrder) => o.number)).toEqual([draft.body.order.number, order.number]);
    const received = await tech.get(`/api/purchase-orders?site=${w.siteA.id}&status=received`);
    expect(received.body.items.map((o: PurchaseOrder) => o.id)).toEqual([order.id]);
    expect((await techB.get(`/api/purchase-orders?site=${w.siteA.id}`)).status).toBe(404);
    expect((await tech.get(`/api/purchase-orders?site=${w.siteA.id}&status=lost`)).status).toBe(400);
  });

  it('drafts one order per supplier from the forecast’s suggestions, and tops up an open draft rather than doubling it', async () => {
    const db = ctx.database.db;
    // Below minimum and nothing due: the suggestion is the minimum less what is on hand, in packs.
    await db.insert(partStock).values({ siteId: w.siteB.id, partId: padsId, onHand: 0, minimum: 3 }).onConflictDoNothing();
    await db.insert(partStock).values({ siteId: w.siteB.id, partId: oilId, onHand: 0, minimum: 5 }).onConflictDoNothing();
    const first = await manager.post('/api/purchase-orders/draft-from-forecast').send({ siteId: w.siteB.id });
    expect(first.status).toBe(201);
    const drafts = first.body.items as PurchaseOrder[];
    expect(drafts.map((d) => d.supplier.name).sort()).toEqual(['Dyke End Components', 'Harbour Lubricants']);
    const padsLine = drafts.flatMap((d) => d.lines).find((l) => l.partId === padsId)!;
    const oilLine = drafts.flatMap((d) => d.lines).find((l) => l.partId === oilId)!;
    expect(padsLine.quantity).toBe(4); // 3 short, packs of 2
    expect(oilLine.quantity).toBe(8); // 5 short, packs of 4
    const again = await manager.post('/api/purchase-orders/draft-from-forecast').send({ siteId: w.siteB.id });
    expect(again.body.items.map((d: PurchaseOrder) => d.id).sort()).toEqual(drafts.map((d) => d.id).sort());
    const lines = await db.select().from(purchaseOrderLines).innerJoin(purchaseOrders, eq(purchaseOrders.id, purchaseOrderLines.orderId)).where(eq(purchaseOrders.siteId, w.siteB.id));
    expect(lines).toHaveLength(2);
  });
});
