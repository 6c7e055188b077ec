import { eq } from 'drizzle-orm';
import type { Db, Tx } from '../db/client';
import { bikeModels, bikes, serviceTasks, valveChecks, valveReadings } from '../db/schema';
import type { SessionUser } from '../../shared/schemas/auth';
import type { CloseValveTask, ValveCard, ValveReadingInput } from '../../shared/schemas/valves';
import { currentShim, valveHistories, valveLayout, type ValveSlot } from '../../shared/domain/valves';
import { clearanceFromFeelers } from '../../shared/domain/feeler';
import { shimSizes } from '../../shared/domain/shims';
import { toMicrons } from '../../shared/domain/microns';
import { audit } from '../audit';
import { HttpError, badRequest, forbidden, notFound } from '../http-error';
import { toModelSummary } from './models';
import { getBike } from './bikes';
import { closeTask, getTask } from './tasks';
import { readingsForBikes } from './valve-history';
import { moveStock, stockAt, takeShim } from './shim-stock';
import { partsForItem } from './parts';

async function modelOf(db: Db | Tx, bikeId: string) {
  const [row] = await db.select({ m: bikeModels }).from(bikes).innerJoin(bikeModels, eq(bikeModels.id, bikes.modelId)).where(eq(bikes.id, bikeId));
  return toModelSummary(row.m);
}

export async function valveCard(db: Db, user: SessionUser, taskId: string): Promise<ValveCard> {
  const task = await getTask(db, user, taskId);
  if (!task) throw notFound('That task');
  if (task.category !== 'valves') throw badRequest('This task is not a valve clearance check.');
  const model = await modelOf(db, task.bikeId);
  const bike = (await getBike(db, user.siteIds, task.bikeId))!;
  const histories = valveHistories((await readingsForBikes(db, [task.bikeId])).get(task.bikeId) ?? []);
  const [row] = await db.select({ draft: serviceTasks.draft }).from(serviceTasks).where(eq(serviceTasks.id, taskId));
  const sizes = model.shimMinMm && model.shimMaxMm && model.shimStepMm ? shimSizes({ minMm: model.shimMinMm, maxMm: model.shimMaxMm, stepMm: model.shimStepMm }) : [];
  return {
    task,
    adjuster: model.adjuster,
    odometerUnit: bike.odometerUnit,
    latestOdometer: bike.latestOdometer,
    valves: valveLayout(model).map((v) => {
      const h = histories.get(v.valveId) ?? [];
      return { ...v, currentShimMm: currentShim(h), lastAsFoundMm: h.at(-1)?.asFoundMm ?? null };
    }),
    shimSizesMm: sizes,
    stock: await stockAt(db, task.siteId),
    parts: await partsForItem(db, task.siteId, task.itemId),
    draft: row?.draft ?? null,
  };
}

export async function saveDraft(db: Db, user: SessionUser, taskId: string, draft: unknown) {
  const task = await getTask(db, user, taskId);
  if (!task) throw notFound('That task');
  if (task.status === 'done' || task.status === 'cancelled') throw new HttpError(409, 'conflict', 'This task is closed; the draft was not saved.');
  await db.update(serviceTasks).set({ draft }).where(eq(serviceTasks.id, taskId));
}

interface Measured {
  slot: ValveSlot;
  input: ValveReadingInput;
  asFoundUm: number;
  asLeftUm: number | null;
}

function measure(layout: ValveSlot[], readings: ValveReadingInput[]): Measured[] {
  const byId = new Map(readings.map((r) => [r.valveId, r]));
  const unknown = readings.filter((r) => !layout.some((s) => s.valveId === r.valveId));
  if (unknown.length) throw badRequest('Some readings name valves this engine does not have.', unknown.map((r) => ({ path: `readings.${r.valveId}`, message: 'No such valve.' })));
  const missing = layout.filter((s) => !byId.has(s.valveId));
  if (missing.length) throw badRequest(`Every valve needs an as-found reading. Missing: ${missing.map((m) => m.label).join(', ')}.`, missing.map((m) => ({ path: `readings.${m.valveId}`, message: 'No reading.' })));
  return layout.map((slot) => {
    const input = byId.get(slot.valveId)!;
    let found: number;
    try {
      found = input.asFound.method === 'feeler' ? clearanceFromFeelers(input.asFound).estimateMm : input.asFound.mm;
    } catch (e) {
      throw badRequest(`${slot.label}: ${(e as Error).message}`, [{ path: `readings.${slot.valveId}.asFound`, message: (e as Error).message }]);
    }
    const changed = input.shimAfterMm != null && input.shimAfterMm !== input.shimBeforeMm;
    if ((changed || input.screwAdjusted) && input.asLeftMm == null)
      throw badRequest(`${slot.label}: measure and enter the clearance after adjusting.`, [{ path: `readings.${slot.valveId}.asLeftMm`, message: 'Needed after an adjustment.' }]);
    return { slot, input, asFoundUm: toMicrons(found), asLeftUm: input.asLeftMm == null ? null : toMicrons(input.asLeftMm) };
  });
}

/** Signs off a valve clearance task with a reading per valve; shim stock follows what came out and went in. */
export async function closeValveTask(db: Db, user: SessionUser, taskId: string, input: CloseValveTask, now: Date) {
  return closeTask(db, user, taskId, input, now, async (tx, c) => {
    const model = await modelOf(tx, c.bikeId);
    const measured = measure(valveLayout(model), input.readings);
    const outside = measured.filter((m) => {
      const left = m.asLeftUm ?? m.asFoundUm;
      return left < toMicrons(m.slot.specMinMm) || left > toMicrons(m.slot.specMaxMm);
    });
    if (outside.length) {
      if (!input.override) throw new HttpError(409, 'conflict', `Left outside spec: ${outside.map((o) => o.slot.label).join(', ')}. Adjust them, or a manager signs off with a reason.`, outside.map((o) => ({ path: `readings.${o.slot.valveId}.asLeftMm`, message: `Outside ${o.slot.specMinMm.toFixed(2)}–${o.slot.specMaxMm.toFixed(2)} mm.` })));
      if (user.role !== 'manager') throw forbidden('Only a manager can sign off a valve left outside its spec.');
      await audit(tx, { userId: user.id, action: 'override', entity: 'task', entityId: taskId, changes: { valves: outside.map((o) => o.slot.label), reason: input.override.reason } });
    }
    const [check] = await tx.insert(valveChecks).values({ bikeId: c.bikeId, taskId, date: c.date, odometerKm: c.odometerKm, checkedBy: user.id }).returning({ id: valveChecks.id });
    await tx.insert(valveReadings).values(
      measured.map((m) => ({
        checkId: check.id,
        cylinder: m.slot.cylinder,
        side: m.slot.side,
        position: m.slot.position,
        asFoundUm: m.asFoundUm,
        asLeftUm: m.asLeftUm,
        shimBeforeUm: m.input.shimBeforeMm == null ? null : toMicrons(m.input.shimBeforeMm),
        shimAfterUm: m.input.shimAfterMm == null ? null : toMicrons(m.input.shimAfterMm),
        method: m.input.asFound.method,
      })),
    );
    // Removed shims go back as used stock first, so a shim moved to another valve nets out.
    for (const m of measured) {
      const { shimBeforeMm: before, shimAfterMm: after } = m.input;
      if (after == null || after === before) continue;
      if (before != null) await moveStock(tx, { siteId: c.siteId, sizeMm: before, condition: 'used', delta: 1, reason: `Removed from ${m.slot.label}`, taskId, by: user.id, at: now });
    }
    for (const m of measured) {
      const { shimBeforeMm: before, shimAfterMm: after } = m.input;
      if (after == null || after === before) continue;
      await takeShim(tx, c.siteId, after, `Fitted to ${m.slot.label}`, taskId, user.id, now);
    }
    await tx.update(serviceTasks).set({ draft: null }).where(eq(serviceTasks.id, taskId));
  }, true);
}
