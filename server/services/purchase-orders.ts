import { and, asc, desc, eq, inArray, sql } from 'drizzle-orm';
import Papa from 'papaparse';
import type { Db, DbOrTx } from '../db/client';
import { parts, purchaseOrderLines, purchaseOrders, sites, suppliers, users } from '../db/schema';
import { canSeeSite } from '../../shared/domain/policies';
import { ORDER_CSV_COLUMNS, formatQty, judgeReceipt, orderCsvRows, orderLabel, roundQty, type OrderState } from '../../shared/domain/parts';
import type { SessionUser } from '../../shared/schemas/auth';
import type { PurchaseOrder, PurchaseOrderCreate, PurchaseOrderReceive, Shortage } from '../../shared/schemas/parts';
import { audit } from '../audit';
import { badRequest, conflict, notFound } from '../http-error';
import { enqueue } from '../mail/outbox';
import { escapeHtml } from '../mail/site-managers';
import { bookMovement, forecastFor } from './parts';
import type { ReadCache } from '../cache/read-cache';

const siteOf = (user: SessionUser, siteId: string) => {
  if (!canSeeSite(user, siteId)) throw notFound('That site');
};

async function ordersWhere(db: DbOrTx, where: ReturnType<typeof and>): Promise<PurchaseOrder[]> {
  const heads = await db
    .select({ o: purchaseOrders, supplier: { id: suppliers.id, name: suppliers.name, email: suppliers.email } })
    .from(purchaseOrders)
    .innerJoin(suppliers, eq(suppliers.id, purchaseOrders.supplierId))
    .where(where)
    .orderBy(desc(purchaseOrders.number));
  if (!heads.length) return [];
  const lines = await db
    .select({ l: purchaseOrderLines, p: { partNumber: parts.partNumber, name: parts.name, unit: parts.unit, packSize: parts.packSize, unitCostPence: parts.unitCostPence } })
    .from(purchaseOrderLines)
    .innerJoin(parts, eq(parts.id, purchaseOrderLines.partId))
    .where(inArray(purchaseOrderLines.orderId, heads.map((h) => h.o.id)))
    .orderBy(asc(parts.family), asc(parts.name));
  return heads.map(({ o, supplier }) => ({
    id: o.id, number: o.number, siteId: o.siteId, supplier, status: o.status, note: o.note,
    createdAt: o.createdAt.toISOString(), sentAt: o.sentAt?.toISOString() ?? null, receivedAt: o.receivedAt?.toISOString() ?? null,
    lines: lines.filter((x) => x.l.orderId === o.id).map(({ l, p }) => ({ partId: l.partId, ...p, quantity: roundQty(l.quantity), received: roundQty(l.received) })),
  }));
}

export async function listOrders(db: DbOrTx, user: SessionUser, siteId: string, status?: OrderState): Promise<PurchaseOrder[]> {
  siteOf(user, siteId);
  return ordersWhere(db, and(eq(purchaseOrders.siteId, siteId), status ? eq(purchaseOrders.status, status) : undefined));
}

async function orderById(db: DbOrTx, user: SessionUser, id: string): Promise<PurchaseOrder> {
  const [order] = await ordersWhere(db, and(eq(purchaseOrders.id, id)));
  if (!order || !canSeeSite(user, order.siteId)) throw notFound('That purchase order');
  return order;
}

/** The order row, locked until the transaction ends, so two people cannot send or receive it at once. */
async function lockOrder(tx: DbOrTx, user: SessionUser, id: string) {
  const [row] = await tx.select().from(purchaseOrders).where(eq(purchaseOrders.id, id)).for('update');
  if (!row || !canSeeSite(user, row.siteId)) throw notFound('That purchase order');
  return row;
}

/** Every line's part must come from the order's supplier: one order, one supplier, one e-mail. */
async function checkLines(tx: DbOrTx, supplierId: string, lines: readonly { partId: string }[]) {
  const found = await tx.select({ id: parts.id, name: parts.name, supplierId: parts.supplierId }).from(parts).where(inArray(parts.id, lines.map((l) => l.partId)));
  for (const l of lines) {
    const p = found.find((f) => f.id === l.partId);
    if (!p) throw notFound('A part on the order');
    if (p.supplierId !== supplierId) throw badRequest(`${p.name} does not come from this supplier: put it on an order to its own supplier.`, [{ path: 'lines', message: `${p.name} comes from another supplier.` }]);
  }
}

async function nextNumber(tx: DbOrTx): Promise<number> {
  // Numbers are handed out one at a time across every site: the order table is locked for the rest of the transaction.
  await tx.execute(sql`lock table purchase_orders in share row exclusive mode`);
  const [{ n }] = await tx.select({ n: sql<number>`coalesce(max(${purchaseOrders.number}), 0) + 1`.mapWith(Number) }).from(purchaseOrders);
  return n;
}

async function insertDraft(tx: DbOrTx, user: SessionUser, b: PurchaseOrderCreate, now: Date): Promise<string> {
  const number = await nextNumber(tx);
  const [o] = await tx.insert(purchaseOrders).values({ number, siteId: b.siteId, supplierId: b.supplierId, note: b.note || null, createdBy: user.id, createdAt: now }).returning({ id: purchaseOrders.id });
  await tx.insert(purchaseOrderLines).values(b.lines.map((l) => ({ orderId: o.id, partId: l.partId, quantity: roundQty(l.quantity) })));
  await audit(tx, { userId: user.id, action: 'order-draft', entity: 'purchase-order', entityId: o.id, changes: { number, lines: b.lines } });
  return o.id;
}

export async function createOrder(db: Db, user: SessionUser, b: PurchaseOrderCreate, now: Date): Promise<PurchaseOrder> {
  siteOf(user, b.siteId);
  const id = await db.transaction(async (tx) => {
    const [s] = await tx.select({ id: suppliers.id }).from(suppliers).where(eq(suppliers.id, b.supplierId));
    if (!s) throw notFound('That supplier');
    await checkLines(tx, b.supplierId, b.lines);
    return insertDraft(tx, user, b, now);
  });
  return orderById(db, user, id);
}

/**
 * One draft per supplier from the site's cautious suggestions. A draft already open for that
 * supplier is topped up to the suggestion rather than doubled; a part with no supplier is left out.
 */
export async function draftsFromForecast(db: Db, user: SessionUser, siteId: string, now: Date, cache?: ReadCache): Promise<PurchaseOrder[]> {
  siteOf(user, siteId);
  const forecast = await forecastFor(db, user, siteId, 8, now, cache);
  const wanted = forecast.parts.filter((p) => p.suggested.quantity > 0);
  if (!wanted.length) return [];
  const ids = await db.transaction(async (tx) => {
    const supplierOf = new Map((await tx.select({ id: parts.id, supplierId: parts.supplierId }).from(parts).where(inArray(parts.id, wanted.map((w) => w.partId)))).map((p) => [p.id, p.supplierId]));
    const bySupplier = new Map<string, { partId: string; quantity: number }[]>();
    for (const w of wanted) {
      const s = supplierOf.get(w.partId);
      if (s) bySupplier.set(s, [...(bySupplier.get(s) ?? []), { partId: w.partId, quantity: w.suggested.quantity }]);
    }
    const touched: string[] = [];
    for (const [supplierId, lines] of [...bySupplier].sort(([a], [b]) => a.localeCompare(b))) {
      const [draft] = await tx
        .select({ id: purchaseOrders.id })
        .from(purchaseOrders)
        .where(and(eq(purchaseOrders.siteId, siteId), eq(purchaseOrders.supplierId, supplierId), eq(purchaseOrders.status, 'draft')))
        .orderBy(desc(purchaseOrders.number))
        .limit(1)
        .for('update');
      if (!draft) {
        touched.push(await insertDraft(tx, user, { siteId, supplierId, lines, note: 'Drafted from the forecast' }, now));
        continue;
      }
      for (const l of lines)
        await tx
          .insert(purchaseOrderLines)
          .values({ orderId: draft.id, partId: l.partId, quantity: l.quantity })
          .onConflictDoUpdate({ target: [purchaseOrderLines.orderId, purchaseOrderLines.partId], set: { quantity: sql`greatest(${purchaseOrderLines.quantity}, excluded.quantity)` } });
      await audit(tx, { userId: user.id, action: 'order-topped-up', entity: 'purchase-order', entityId: draft.id, changes: { lines } });
      touched.push(draft.id);
    }
    return touched;
  });
  return ordersWhere(db, and(inArray(purchaseOrders.id, ids)));
}

/** The CSV the supplier receives (RFC 4180: CRLF line ends, quoted where needed). */
export function orderCsv(order: PurchaseOrder): string {
  return `${Papa.unparse({ fields: [...ORDER_CSV_COLUMNS], data: orderCsvRows(order.lines) }, { newline: '\r\n' })}\r\n`;
}

/** Draft → sent: the supplier's e-mail with the CSV goes into the outbox in the same transaction. */
export async function sendOrder(db: Db, user: SessionUser, id: string, now: Date): Promise<PurchaseOrder> {
  await db.transaction(async (tx) => {
    const row = await lockOrder(tx, user, id);
    if (row.status !== 'draft') throw conflict(`${orderLabel(row.number)} was already sent${row.sentAt ? ` on ${row.sentAt.toISOString().slice(0, 10)}` : ''}; it cannot be sent twice.`);
    await tx.update(purchaseOrders).set({ status: 'sent', sentAt: now }).where(eq(purchaseOrders.id, id));
    const order = await orderById(tx, user, id);
    const [site] = await tx.select({ name: sites.name }).from(sites).where(eq(sites.id, order.siteId));
    const [sender] = await tx.select({ name: users.name, email: users.email }).from(users).where(eq(users.id, user.id));
    const label = orderLabel(order.number);
    const text = [
      `Purchase order ${label}`,
      `Deliver to: ${site.name}`,
      '',
      ...order.lines.map((l) => `${l.partNumber}  ${l.name}: ${formatQty(l.quantity, l.unit)}`),
      '',
      order.note ? `Note: ${order.note}\n` : '',
      `The same lines are attached as ${label}.csv. Please confirm the delivery date to ${sender.name} <${sender.email}>.`,
    ].join('\n');
    const html = `<h1 style="font-size:18px">Purchase order ${escapeHtml(label)}</h1><p>Deliver to: ${escapeHtml(site.name)}</p><table cellpadding="4" style="border-collapse:collapse">${order.lines
      .map((l) => `<tr><td>${escapeHtml(l.partNumber)}</td><td>${escapeHtml(l.name)}</td><td style="text-align:right">${escapeHtml(formatQty(l.quantity, l.unit))}</td></tr>`)
      .join('')}</table>${order.note ? `<p>Note: ${escapeHtml(order.note)}</p>` : ''}<p>The same lines are attached as ${escapeHtml(label)}.csv. Please confirm the delivery date to ${escapeHtml(sender.name)} &lt;${escapeHtml(sender.email)}&gt;.</p>`;
    await enqueue(tx, { dedupeKey: `purchase-order:${id}:sent`, to: order.supplier.email, subject: `Purchase order ${label} for ${site.name}`, text, html, attachments: [{ filename: `${label}.csv`, contentType: 'text/csv; charset=utf-8', content: orderCsv(order) }] }, now);
    await audit(tx, { userId: user.id, action: 'order-sent', entity: 'purchase-order', entityId: id, changes: { to: order.supplier.email } });
  });
  return orderById(db, user, id);
}

/** What has not come yet will not: a draft, a sent order or the rest of a part-received one. */
export async function cancelOrder(db: Db, user: SessionUser, id: string): Promise<PurchaseOrder> {
  await db.transaction(async (tx) => {
    const row = await lockOrder(tx, user, id);
    if (row.status === 'received' || row.status === 'cancelled') throw conflict(`${orderLabel(row.number)} is ${row.status === 'received' ? 'received in full' : 'already cancelled'}: there is nothing left to cancel.`);
    await tx.update(purchaseOrders).set({ status: 'cancelled' }).where(eq(purchaseOrders.id, id));
    await audit(tx, { userId: user.id, action: 'order-cancelled', entity: 'purchase-order', entityId: id, changes: { was: row.status } });
  });
  return orderById(db, user, id);
}

/** Books what arrived: each line's stock moves by exactly the amount received, in one transaction with the order. */
export async function receiveOrder(db: Db, user: SessionUser, id: string, b: PurchaseOrderReceive, now: Date): Promise<PurchaseOrder> {
  await db.transaction(async (tx) => {
    const row = await lockOrder(tx, user, id);
    const order = await orderById(tx, user, id);
    const names = (partId: string) => order.lines.find((l) => l.partId === partId)?.name ?? 'That part';
    const verdict = judgeReceipt(row.status, order.lines, b.lines, names);
    if (!verdict.ok) throw row.status === 'draft' || row.status === 'received' || row.status === 'cancelled' ? conflict(verdict.error) : badRequest(verdict.error, [{ path: 'lines', message: verdict.error }]);
    const label = orderLabel(row.number);
    for (const r of b.lines) {
      if (r.quantity === 0) continue;
      const line = order.lines.find((l) => l.partId === r.partId)!;
      await bookMovement(tx, { siteId: row.siteId, partId: r.partId, kind: 'received', quantity: r.quantity, unit: line.unit, reason: `Received on ${label}${b.note ? `: ${b.note}` : ''}`, purchaseOrderId: id, by: user.id, at: now });
      await tx.update(purchaseOrderLines).set({ received: roundQty(line.received + r.quantity) }).where(and(eq(purchaseOrderLines.orderId, id), eq(purchaseOrderLines.partId, r.partId)));
    }
    await tx.update(purchaseOrders).set({ status: verdict.state, receivedAt: verdict.state === 'received' ? now : null }).where(eq(purchaseOrders.id, id));
    await audit(tx, { userId: user.id, action: 'order-received', entity: 'purchase-order', entityId: id, changes: { lines: b.lines, state: verdict.state } });
  });
  return orderById(db, user, id);
}

/** Across the caller's sites: the parts that run out before an order placed today could arrive, with the orders that hold them. */
export async function shortages(db: DbOrTx, user: SessionUser, now: Date, cache?: ReadCache): Promise<Shortage[]> {
  const mine = await db.select({ id: sites.id, name: sites.name }).from(sites).where(inArray(sites.id, user.siteIds.length ? user.siteIds : ['00000000-0000-0000-0000-000000000000'])).orderBy(asc(sites.name));
  const out: Shortage[] = [];
  for (const site of mine) {
    const f = await forecastFor(db, user, site.id, 8, now, cache);
    const short = f.parts.filter((p) => p.shortBeforeDelivery);
    if (!short.length) continue;
    const open = await db
      .select({ id: purchaseOrders.id, number: purchaseOrders.number, status: purchaseOrders.status, partId: purchaseOrderLines.partId })
      .from(purchaseOrders)
      .innerJoin(purchaseOrderLines, eq(purchaseOrderLines.orderId, purchaseOrders.id))
      .where(and(eq(purchaseOrders.siteId, site.id), inArray(purchaseOrders.status, ['draft', 'sent', 'part-received']), inArray(purchaseOrderLines.partId, short.map((p) => p.partId))))
      .orderBy(asc(purchaseOrders.number));
    for (const p of short)
      out.push({
        siteId: site.id, siteName: site.name, partId: p.partId, partNumber: p.partNumber, name: p.name, unit: p.unit, onHand: p.onHand, onOrder: p.onOrder,
        leadTimeDays: p.leadTimeDays, runsOutWeek: p.runsOutWeek, suggested: p.suggested.quantity,
        orders: open.filter((o) => o.partId === p.partId).map(({ id, number, status }) => ({ id, number, status })),
      });
  }
  return out;
}
