import { and, asc, desc, eq, gte, inArray, lte, ne, sql } from 'drizzle-orm';
import type { Db, DbOrTx } from '../db/client';
import {
  bikeModels, bikes, dueStates, odometerReadings, partStock, parts, purchaseOrderLines, purchaseOrders, serviceItemParts, serviceItems,
  serviceTasks, sites, stockMovements, suppliers, users, visitTasks, visits,
} from '../db/schema';
import { addDaysIso, todayInZone } from '../../shared/domain/dates';
import { canSeeSite } from '../../shared/domain/policies';
import { MOVEMENT_WORDS, judgeMovement, roundQty, suggestedOrder, type MovementKind, type PartUnit } from '../../shared/domain/parts';
import {
  dailyDistances, needWithin, runsOutDay, runsOutWeek, RIDING_WINDOW_DAYS, seasonalFactor, simulatePartUse, weeklyNeed, yearAgoDays,
  type ForecastBikeInput, type ForecastItemInput, type YearAgoKm,
} from '../../shared/domain/parts-forecast';
import type { SessionUser } from '../../shared/schemas/auth';
import type { Forecast, Part, PartsUsed, StockLine, StockMovementCreate, StockView, TaskPart } from '../../shared/schemas/parts';
import { audit } from '../audit';
import type { ReadCache } from '../cache/read-cache';
import { jsonTuples, uuidArray } from '../db/json-rows';
import { HttpError, badRequest, notFound } from '../http-error';

/** Orders whose goods are still to come count as "on order". */
const OPEN_ORDER_STATES = ['sent', 'part-received'] as const;

export async function listParts(db: DbOrTx): Promise<Part[]> {
  const rows = await db
    .select({ p: parts, supplier: { id: suppliers.id, name: suppliers.name } })
    .from(parts)
    .leftJoin(suppliers, eq(suppliers.id, parts.supplierId))
    .orderBy(asc(parts.family), asc(parts.name));
  const uses = await db
    .select({ partId: serviceItemParts.partId, model: bikeModels.name, item: serviceItems.name, quantity: serviceItemParts.quantity, share: serviceItemParts.share })
    .from(serviceItemParts)
    .innerJoin(serviceItems, eq(serviceItems.id, serviceItemParts.serviceItemId))
    .innerJoin(bikeModels, eq(bikeModels.id, serviceItems.modelId))
    .orderBy(asc(bikeModels.name), asc(serviceItems.name));
  return rows.map(({ p, supplier }) => ({
    id: p.id, partNumber: p.partNumber, name: p.name, family: p.family, unit: p.unit, packSize: p.packSize, leadTimeDays: p.leadTimeDays,
    unitCostPence: p.unitCostPence, supplier: supplier?.id ? { id: supplier.id, name: supplier.name } : null,
    usedBy: uses.filter((u) => u.partId === p.id).map(({ model, item, quantity, share }) => ({ model, item, quantity, share })),
  }));
}

function siteOf(user: SessionUser, siteId: string) {
  if (!canSeeSite(user, siteId)) throw notFound('That site');
}

/** Every catalogue part with its stock at a site (nothing booked yet reads as zero) and what is on order. */
export async function stockLines(db: DbOrTx, siteId: string): Promise<StockLine[]> {
  const rows = await db
    .select({ p: parts, onHand: partStock.onHand, minimum: partStock.minimum })
    .from(parts)
    .leftJoin(partStock, and(eq(partStock.partId, parts.id), eq(partStock.siteId, siteId)))
    .orderBy(asc(parts.family), asc(parts.name));
  const onOrder = await db
    .select({ partId: purchaseOrderLines.partId, open: sql<number>`sum(${purchaseOrderLines.quantity} - ${purchaseOrderLines.received})`.mapWith(Number) })
    .from(purchaseOrderLines)
    .innerJoin(purchaseOrders, eq(purchaseOrders.id, purchaseOrderLines.orderId))
    .where(and(eq(purchaseOrders.siteId, siteId), inArray(purchaseOrders.status, OPEN_ORDER_STATES)))
    .groupBy(purchaseOrderLines.partId);
  const ordered = new Map(onOrder.map((o) => [o.partId, o.open]));
  return rows.map(({ p, onHand, minimum }) => ({
    partId: p.id, partNumber: p.partNumber, name: p.name, family: p.family, unit: p.unit,
    onHand: roundQty(onHand ?? 0), minimum: minimum ?? 0, onOrder: roundQty(ordered.get(p.id) ?? 0),
  }));
}

export async function stockView(db: DbOrTx, user: SessionUser, siteId: string): Promise<StockView> {
  siteOf(user, siteId);
  const items = await stockLines(db, siteId);
  const recent = await db
    .select({ id: stockMovements.id, partId: stockMovements.partId, kind: stockMovements.kind, delta: stockMovements.delta, reason: stockMovements.reason, by: users.name, at: stockMovements.at })
    .from(stockMovements)
    .leftJoin(users, eq(users.id, stockMovements.by))
    .where(and(eq(stockMovements.siteId, siteId), sql`${stockMovements.partId} is not null`))
    .orderBy(desc(stockMovements.at))
    .limit(30);
  return {
    siteId,
    items,
    recent: recent.map((m) => ({ id: m.id, partId: m.partId!, kind: m.kind ?? 'stock-take', delta: m.delta, reason: m.reason, by: m.by ?? null, at: m.at.toISOString() })),
  };
}

export interface LedgerWrite {
  siteId: string;
  partId: string;
  kind: MovementKind;
  quantity: number;
  unit: PartUnit;
  reason: string;
  taskId?: string | null;
  purchaseOrderId?: string | null;
  by: string | null;
  at: Date;
}

/**
 * Books one movement inside the caller's transaction: the stock row is locked, the movement
 * judged against what is on hand, then the ledger row, the stock figure and the audit entry are
 * written together. A refusal throws before anything is written.
 */
export async function bookMovement(tx: DbOrTx, m: LedgerWrite): Promise<number> {
  const [part] = await tx.select().from(parts).where(eq(parts.id, m.partId));
  if (!part) throw notFound('That part');
  await tx.insert(partStock).values({ siteId: m.siteId, partId: m.partId }).onConflictDoNothing();
  const [row] = await tx
    .select({ onHand: partStock.onHand })
    .from(partStock)
    .where(and(eq(partStock.siteId, m.siteId), eq(partStock.partId, m.partId)))
    .for('update');
  const verdict = judgeMovement({ name: part.name, unit: part.unit }, row.onHand, { kind: m.kind, quantity: m.quantity, unit: m.unit });
  if (!verdict.ok) throw badRequest(verdict.error, [{ path: 'quantity', message: verdict.error }]);
  const onHand = roundQty(row.onHand + verdict.delta);
  await tx.insert(stockMovements).values({
    siteId: m.siteId, partId: m.partId, kind: m.kind, delta: verdict.delta, reason: m.reason || MOVEMENT_WORDS[m.kind],
    taskId: m.taskId ?? null, purchaseOrderId: m.purchaseOrderId ?? null, by: m.by, at: m.at,
  });
  await tx.update(partStock).set({ onHand }).where(and(eq(partStock.siteId, m.siteId), eq(partStock.partId, m.partId)));
  await audit(tx, { userId: m.by, action: `stock-${m.kind}`, entity: 'part-stock', entityId: `${m.siteId}:${m.partId}`, changes: { quantity: m.quantity, unit: m.unit, delta: verdict.delta, onHand, reason: m.reason } });
  return onHand;
}

/** The parts a service item takes, with what the site holds: the task card pre-fills those every service uses. */
export async function partsForItem(db: DbOrTx, siteId: string, serviceItemId: string): Promise<TaskPart[]> {
  const rows = await db
    .select({ p: parts, quantity: serviceItemParts.quantity, share: serviceItemParts.share, onHand: partStock.onHand })
    .from(serviceItemParts)
    .innerJoin(parts, eq(parts.id, serviceItemParts.partId))
    .leftJoin(partStock, and(eq(partStock.partId, parts.id), eq(partStock.siteId, siteId)))
    .where(eq(serviceItemParts.serviceItemId, serviceItemId))
    .orderBy(desc(serviceItemParts.share), asc(parts.name));
  return rows.map(({ p, quantity, share, onHand }) => ({
    partId: p.id, partNumber: p.partNumber, name: p.name, unit: p.unit, usual: roundQty(quantity), share, suggested: share >= 1 ? roundQty(quantity) : 0, onHand: roundQty(onHand ?? 0),
  }));
}

/** Books what a closed task took from the shelf, in the closing transaction; a line the shelf cannot cover refuses the whole close. */
export async function bookPartsUsed(tx: DbOrTx, o: { siteId: string; taskId: string; what: string; lines: PartsUsed; by: string; at: Date }) {
  for (const l of o.lines) {
    if (l.quantity === 0) continue;
    try {
      await bookMovement(tx, { siteId: o.siteId, partId: l.partId, kind: 'used', quantity: l.quantity, unit: l.unit, reason: `Used on ${o.what}`, taskId: o.taskId, by: o.by, at: o.at });
    } catch (e) {
      // The card shows the refusal beside the parts, and keeps everything typed.
      if (e instanceof HttpError) throw badRequest(`${e.message} Change what was used, or book the delivery or a stock-take on the stock page first.`, [{ path: 'parts', message: e.message }]);
      throw e;
    }
  }
}

/** A movement typed on the stock screen; a transfer books both sides in one transaction. */
export async function recordMovement(db: Db, user: SessionUser, b: StockMovementCreate, now: Date): Promise<StockView> {
  siteOf(user, b.siteId);
  if (b.otherSiteId) siteOf(user, b.otherSiteId);
  await db.transaction(async (tx) => {
    const base = { partId: b.partId, quantity: b.quantity, unit: b.unit, by: user.id, at: now };
    if (b.kind === 'transfer-out' || b.kind === 'transfer-in') {
      const [other] = await tx.select({ name: sites.name }).from(sites).where(eq(sites.id, b.otherSiteId!));
      if (!other) throw notFound('The other site');
      const [from, to] = b.kind === 'transfer-out' ? [b.siteId, b.otherSiteId!] : [b.otherSiteId!, b.siteId];
      const note = b.note ? ` (${b.note})` : '';
      await bookMovement(tx, { ...base, siteId: from, kind: 'transfer-out', reason: `Transfer to another site${note}` });
      await bookMovement(tx, { ...base, siteId: to, kind: 'transfer-in', reason: `Transfer from another site${note}` });
    } else {
      await bookMovement(tx, { ...base, siteId: b.siteId, kind: b.kind, reason: b.note ? `${MOVEMENT_WORDS[b.kind]}: ${b.note}` : MOVEMENT_WORDS[b.kind] });
    }
  });
  return stockView(db, user, b.siteId);
}

export async function setPartMinimum(db: Db, user: SessionUser, siteId: string, partId: string, minimum: number): Promise<StockView> {
  siteOf(user, siteId);
  await db.transaction(async (tx) => {
    const [part] = await tx.select({ id: parts.id }).from(parts).where(eq(parts.id, partId));
    if (!part) throw notFound('That part');
    await tx.insert(partStock).values({ siteId, partId, minimum }).onConflictDoUpdate({ target: [partStock.siteId, partStock.partId], set: { minimum } });
    await audit(tx, { userId: user.id, action: 'stock-minimum', entity: 'part-stock', entityId: `${siteId}:${partId}`, changes: { minimum } });
  });
  return stockView(db, user, siteId);
}

/** The inputs of a site's forecast: its bikes, their due states and recent riding, and the plan. */
/** The site's riding a year back, around the same calendar days, for the seasonal factor. */
async function yearAgoKm(db: DbOrTx, bikeIds: string[], today: string, horizonDays: number): Promise<YearAgoKm[]> {
  const d = yearAgoDays(today, RIDING_WINDOW_DAYS, horizonDays);
  // A bike's odometer on a day is its greatest reading by then; one read up to a month before the window counts.
  const rows = await db
    .select({
      atWindowStart: sql<number | null>`max(${odometerReadings.odometerKm}) filter (where ${odometerReadings.date} <= ${d.windowStart})`.mapWith((v) => (v === null ? null : Number(v))),
      atYearAgo: sql<number | null>`max(${odometerReadings.odometerKm}) filter (where ${odometerReadings.date} <= ${d.yearAgo})`.mapWith((v) => (v === null ? null : Number(v))),
      atHorizonEnd: sql<number | null>`max(${odometerReadings.odometerKm})`.mapWith((v) => (v === null ? null : Number(v))),
    })
    .from(odometerReadings)
    .where(and(inArray(odometerReadings.bikeId, bikeIds), gte(odometerReadings.date, addDaysIso(d.windowStart, -30)), lte(odometerReadings.date, d.horizonEnd)))
    .groupBy(odometerReadings.bikeId);
  return rows;
}

async function forecastInputs(db: DbOrTx, siteId: string, today: string, horizonDays: number): Promise<ForecastBikeInput[]> {
  const uses = await db
    .select({ serviceItemId: serviceItemParts.serviceItemId, partId: serviceItemParts.partId, quantity: serviceItemParts.quantity, share: serviceItemParts.share })
    .from(serviceItemParts);
  if (!uses.length) return [];
  const usesByItem = new Map<string, { partId: string; quantity: number; share: number }[]>();
  for (const u of uses) {
    const list = usesByItem.get(u.serviceItemId) ?? [];
    if (!list.length) usesByItem.set(u.serviceItemId, list);
    list.push({ partId: u.partId, quantity: u.quantity, share: u.share });
  }
  const itemIds = [...usesByItem.keys()];
  const fleet = await db
    .select({ id: bikes.id })
    .from(bikes)
    .where(and(eq(bikes.siteId, siteId), ne(bikes.status, 'retired')));
  if (!fleet.length) return [];
  const bikeIds = fleet.map((b) => b.id);
  const states = await db
    .select({ bikeId: dueStates.bikeId, serviceItemId: dueStates.serviceItemId, dueAtKm: dueStates.dueAtKm, dueByDate: dueStates.dueByDate, currentKm: dueStates.currentKm, everyKm: serviceItems.everyKm, everyMonths: serviceItems.everyMonths })
    .from(dueStates)
    .innerJoin(serviceItems, eq(serviceItems.id, dueStates.serviceItemId))
    .where(and(inArray(dueStates.bikeId, bikeIds), inArray(dueStates.serviceItemId, itemIds)));
  const since = addDaysIso(today, -RIDING_WINDOW_DAYS);
  const season = seasonalFactor(await yearAgoKm(db, bikeIds, today, horizonDays), RIDING_WINDOW_DAYS, horizonDays);
  // One row per bike, its readings as two arrays in date order, all as one JSON value: a large site
  // has a hundred thousand readings in the window, and rows of columns cross from PGlite slowly.
  const readings = await jsonTuples<[string, string[], number[]]>(
    db,
    sql`select json_build_array(${odometerReadings.bikeId}, array_agg(${odometerReadings.date} order by ${odometerReadings.date}), array_agg(${odometerReadings.odometerKm} order by ${odometerReadings.date})) as a
        from ${odometerReadings} where ${odometerReadings.bikeId} = any(${uuidArray(bikeIds)}) and ${odometerReadings.date} >= ${since} group by ${odometerReadings.bikeId}`,
  );
  // Open work: a planned visit's day, else the task's due date, is when its parts go.
  const open = await db
    .select({ bikeId: serviceTasks.bikeId, serviceItemId: serviceTasks.serviceItemId, dueDate: serviceTasks.dueDate, visitStart: visits.startAt })
    .from(serviceTasks)
    .leftJoin(visitTasks, eq(visitTasks.taskId, serviceTasks.id))
    .leftJoin(visits, and(eq(visits.id, visitTasks.visitId), eq(visits.status, 'planned')))
    .where(and(inArray(serviceTasks.bikeId, bikeIds), inArray(serviceTasks.status, ['open', 'in_progress']), inArray(serviceTasks.serviceItemId, itemIds)));
  const planned = new Map<string, string>();
  for (const o of open) {
    const day = o.visitStart ? o.visitStart.toISOString().slice(0, 10) : o.dueDate && o.dueDate > today ? o.dueDate : today;
    planned.set(`${o.bikeId}|${o.serviceItemId}`, day < today ? today : day);
  }
  const readingsOf = new Map(readings.map(([bikeId, dates, km]) => [bikeId, dates.map((date, i) => ({ date, odometerKm: km[i] }))]));
  const byBike = new Map<string, ForecastBikeInput>();
  for (const s of states) {
    let bike = byBike.get(s.bikeId);
    if (!bike) {
      bike = { bikeId: s.bikeId, siteId, currentKm: s.currentKm, dailyKm: dailyDistances(readingsOf.get(s.bikeId) ?? [], RIDING_WINDOW_DAYS).map((km) => km * season), items: [] };
      byBike.set(s.bikeId, bike);
    }
    (bike.items as ForecastItemInput[]).push({
      serviceItemId: s.serviceItemId, everyKm: s.everyKm, everyMonths: s.everyMonths, nextDueKm: s.dueAtKm, nextDueDate: s.dueByDate,
      plannedDate: planned.get(`${s.bikeId}|${s.serviceItemId}`) ?? null, parts: usesByItem.get(s.serviceItemId) ?? [],
    });
  }
  return [...byBike.values()].sort((a, b) => (a.bikeId < b.bikeId ? -1 : 1));
}

/** The site's visits as they stand: their count and the latest change to any of them. */
async function visitsSignature(db: DbOrTx, siteId: string) {
  const [v] = await db
    .select({ n: sql<number>`count(*)::int`, at: sql<string | null>`max(${visits.updatedAt})::text` })
    .from(visits)
    .where(eq(visits.siteId, siteId));
  return `${v.n}@${v.at ?? '-'}`;
}

/**
 * The site's forecast. With a cache, the simulation (the costly part) is kept per site, day and
 * horizon until the fleet's data, the site's visits or a service's parts change; the shelf is read fresh each time.
 */
export async function forecastFor(db: DbOrTx, user: SessionUser, siteId: string, weeks: number, now: Date, cache?: ReadCache): Promise<Forecast> {
  siteOf(user, siteId);
  const [site] = await db.select({ timeZone: sites.timeZone }).from(sites).where(eq(sites.id, siteId));
  if (!site) throw notFound('That site');
  const today = todayInZone(site.timeZone, now);
  const simulate = async () => simulatePartUse(await forecastInputs(db, siteId, today, weeks * 7), { today, weeks, seed: siteId });
  // The plan's visits are not counted in a data version (a re-plan must not take the fleet's lock
  // early): their number and latest change at the site name them in the key instead.
  const sim = cache ? await cache.remember(`parts-simulation\n${siteId}\n${today}\n${weeks}\n${await visitsSignature(db, siteId)}`, ['fleet'], simulate) : await simulate();
  const stock = await stockLines(db, siteId);
  const catalogue = new Map((await db.select({ id: parts.id, leadTimeDays: parts.leadTimeDays, packSize: parts.packSize }).from(parts)).map((p) => [p.id, p]));
  const lineOf = new Map(sim.lines.map((l) => [l.partId, l]));
  const out: Forecast['parts'] = [];
  for (const s of stock) {
    const line = lineOf.get(s.partId);
    const p = catalogue.get(s.partId)!;
    const need = line ? weeklyNeed(sim, line) : sim.weekStarts.map((weekStart) => ({ weekStart, p50: 0, p90: 0, cumulativeP50: 0, cumulativeP90: 0 }));
    const leadTimeNeed = line ? needWithin(sim, line, p.leadTimeDays) : 0;
    const outDay = line ? runsOutDay(sim, line, s.onHand + s.onOrder) : null;
    out.push({
      partId: s.partId, siteId, partNumber: s.partNumber, name: s.name, unit: s.unit, onHand: s.onHand, onOrder: s.onOrder, minimum: s.minimum,
      leadTimeDays: p.leadTimeDays, weeks: need, runsOutWeek: runsOutWeek(need, s.onHand),
      shortBeforeDelivery: outDay !== null && outDay < p.leadTimeDays,
      suggested: { ...suggestedOrder({ leadTimeNeed, minimum: s.minimum, onHand: s.onHand, onOrder: s.onOrder, packSize: p.packSize }), leadTimeNeed },
    });
  }
  return { siteId, today, runs: sim.runs, parts: out };
}
