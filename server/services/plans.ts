import { asc, count, eq, inArray, and, ne } from 'drizzle-orm';
import type { Db, DbOrTx } from '../db/client';
import { bikeModels, bikes, readingTemplates, serviceItems, serviceRecords } from '../db/schema';
import type { ModelUpsert, ServiceItemUpsert } from '../../shared/schemas/plans';
import { describeRule } from '../../shared/domain/due';
import { toMicrons } from '../../shared/domain/microns';
import { audit, diff } from '../audit';
import { conflict, notFound } from '../http-error';
import { toModelSummary } from './models';
import { loadDueInputs } from './due-data';
import { applyDue, computeAll } from './due';

const modelRow = (m: ModelUpsert) => ({
  name: m.name,
  cylinders: m.cylinders,
  intakeValvesPerCylinder: m.intakeValvesPerCylinder,
  exhaustValvesPerCylinder: m.exhaustValvesPerCylinder,
  adjuster: m.adjuster,
  intakeMinUm: toMicrons(m.intakeMinMm),
  intakeMaxUm: toMicrons(m.intakeMaxMm),
  exhaustMinUm: toMicrons(m.exhaustMinMm),
  exhaustMaxUm: toMicrons(m.exhaustMaxMm),
  shimMinUm: m.adjuster === 'shim-under-bucket' && m.shimMinMm != null ? toMicrons(m.shimMinMm) : null,
  shimMaxUm: m.adjuster === 'shim-under-bucket' && m.shimMaxMm != null ? toMicrons(m.shimMaxMm) : null,
  shimStepUm: m.adjuster === 'shim-under-bucket' && m.shimStepMm != null ? toMicrons(m.shimStepMm) : null,
});

export async function modelDetail(db: DbOrTx, id: string) {
  const [m] = await db.select().from(bikeModels).where(eq(bikeModels.id, id));
  if (!m) throw notFound('That model');
  const items = await db.select().from(serviceItems).where(eq(serviceItems.modelId, id)).orderBy(asc(serviceItems.name));
  const templates = items.length
    ? await db.select().from(readingTemplates).where(inArray(readingTemplates.serviceItemId, items.map((i) => i.id))).orderBy(asc(readingTemplates.position))
    : [];
  const [{ n }] = await db.select({ n: count() }).from(bikes).where(and(eq(bikes.modelId, id), ne(bikes.status, 'retired')));
  return {
    model: toModelSummary(m),
    bikes: n,
    items: items.map((i) => ({
      id: i.id,
      name: i.name,
      category: i.category,
      everyKm: i.everyKm,
      everyMonths: i.everyMonths,
      firstAtKm: i.firstAtKm,
      rrule: i.rrule,
      ruleText: i.rrule ? describeRule(i.rrule) : null,
      safetyCritical: i.safetyCritical,
      estimatedMinutes: i.estimatedMinutes,
      readings: templates
        .filter((t) => t.serviceItemId === i.id)
        .map((t) => ({ id: t.id, label: t.label, kind: t.kind, unit: t.unit, min: t.min, max: t.max, safetyCritical: t.safetyCritical })),
    })),
  };
}

/** A changed plan moves the dues of every bike of the model, at once. */
async function recomputeModel(tx: DbOrTx, modelId: string, now: Date) {
  const ids = (await tx.select({ id: bikes.id }).from(bikes).where(and(eq(bikes.modelId, modelId), ne(bikes.status, 'retired')))).map((b) => b.id);
  if (!ids.length) return 0;
  const computed = computeAll(await loadDueInputs(tx, now, ids));
  await applyDue(tx, computed, now);
  return ids.length;
}

const nameTaken = (what: string) => conflict(`A ${what} with that name already exists.`, [{ path: 'name', message: 'Already in use.' }]);

export async function createModel(db: Db, by: string, m: ModelUpsert) {
  return db.transaction(async (tx) => {
    const [dupe] = await tx.select({ id: bikeModels.id }).from(bikeModels).where(eq(bikeModels.name, m.name));
    if (dupe) throw nameTaken('model');
    const [row] = await tx.insert(bikeModels).values(modelRow(m)).returning();
    await audit(tx, { userId: by, action: 'create', entity: 'model', entityId: row.id, changes: m });
    return row.id;
  });
}

export async function updateModel(db: Db, by: string, id: string, m: ModelUpsert, now: Date) {
  return db.transaction(async (tx) => {
    const [before] = await tx.select().from(bikeModels).where(eq(bikeModels.id, id));
    if (!before) throw notFound('That model');
    const [dupe] = await tx.select({ id: bikeModels.id }).from(bikeModels).where(and(eq(bikeModels.name, m.name), ne(bikeModels.id, id)));
    if (dupe) throw nameTaken('model');
    const row = modelRow(m);
    await tx.update(bikeModels).set(row).where(eq(bikeModels.id, id));
    await audit(tx, { userId: by, action: 'update', entity: 'model', entityId: id, changes: diff(before, row) });
    return recomputeModel(tx, id, now);
  });
}

async function writeTemplates(tx: DbOrTx, itemId: string, readings: ServiceItemUpsert['readings']) {
  await tx.delete(readingTemplates).where(eq(readingTemplates.serviceItemId, itemId));
  if (readings.length)
    await tx.insert(readingTemplates).values(
      readings.map((r, position) => ({ serviceItemId: itemId, label: r.label, kind: r.kind, unit: r.unit ?? null, min: r.min ?? null, max: r.max ?? null, safetyCritical: r.safetyCritical, position })),
    );
}

const itemRow = (i: ServiceItemUpsert) => ({
  name: i.name,
  category: i.category,
  everyKm: i.everyKm ?? null,
  everyMonths: i.everyMonths ?? null,
  firstAtKm: i.firstAtKm ?? null,
  rrule: i.rrule ?? null,
  safetyCritical: i.safetyCritical,
  estimatedMinutes: i.estimatedMinutes,
});

export async function upsertItem(db: Db, by: string, modelId: string, itemId: string | null, i: ServiceItemUpsert, now: Date) {
  return db.transaction(async (tx) => {
    const [model] = await tx.select({ id: bikeModels.id }).from(bikeModels).where(eq(bikeModels.id, modelId));
    if (!model) throw notFound('That model');
    const [dupe] = await tx.select({ id: serviceItems.id }).from(serviceItems).where(and(eq(serviceItems.modelId, modelId), eq(serviceItems.name, i.name)));
    if (dupe && dupe.id !== itemId) throw nameTaken('service item on this model');
    let id = itemId;
    if (id) {
      const [before] = await tx.select().from(serviceItems).where(and(eq(serviceItems.id, id), eq(serviceItems.modelId, modelId)));
      if (!before) throw notFound('That service item');
      await tx.update(serviceItems).set(itemRow(i)).where(eq(serviceItems.id, id));
      await audit(tx, { userId: by, action: 'update', entity: 'service-item', entityId: id, changes: { ...diff(before, itemRow(i)), readings: i.readings } });
    } else {
      [{ id }] = await tx.insert(serviceItems).values({ ...itemRow(i), modelId }).returning({ id: serviceItems.id });
      await audit(tx, { userId: by, action: 'create', entity: 'service-item', entityId: id, changes: i });
    }
    await writeTemplates(tx, id!, i.readings);
    const bikesRecomputed = await recomputeModel(tx, modelId, now);
    return { id: id!, bikesRecomputed };
  });
}

export async function deleteItem(db: Db, by: string, modelId: string, itemId: string, now: Date) {
  return db.transaction(async (tx) => {
    const [done] = await tx.select({ id: serviceRecords.id }).from(serviceRecords).where(eq(serviceRecords.serviceItemId, itemId)).limit(1);
    if (done) throw conflict('This item has service history, which is kept as evidence; it cannot be removed. Change its interval instead.');
    const [row] = await tx.delete(serviceItems).where(and(eq(serviceItems.id, itemId), eq(serviceItems.modelId, modelId))).returning();
    if (!row) throw notFound('That service item');
    await audit(tx, { userId: by, action: 'delete', entity: 'service-item', entityId: itemId, changes: { name: row.name } });
    return recomputeModel(tx, modelId, now);
  });
}
