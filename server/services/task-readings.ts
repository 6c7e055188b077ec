import { asc, eq, inArray } from 'drizzle-orm';
import type { DbOrTx, Tx } from '../db/client';
import { bikes, readingTemplates, serviceReadings } from '../db/schema';
import type { ReadingTemplate, ReadingValue } from '../../shared/schemas/tasks';
import { describeLimit, outsideLimits } from '../../shared/domain/limits';
import { badRequest } from '../http-error';
import { audit } from '../audit';
import { tellSiteManagers } from '../mail/site-managers';

export async function templatesFor(db: DbOrTx, itemIds: string[]): Promise<Map<string, ReadingTemplate[]>> {
  const by = new Map<string, ReadingTemplate[]>();
  if (!itemIds.length) return by;
  const rows = await db.select().from(readingTemplates).where(inArray(readingTemplates.serviceItemId, itemIds)).orderBy(asc(readingTemplates.position));
  for (const t of rows)
    by.set(t.serviceItemId, [...(by.get(t.serviceItemId) ?? []), { id: t.id, label: t.label, kind: t.kind, unit: t.unit, min: t.min, max: t.max, safetyCritical: t.safetyCritical }]);
  return by;
}

/**
 * Stores the readings a service asks for, judged against their limits. A value outside a
 * safety-critical limit grounds the bike at once, with the reason, and tells the managers.
 */
export async function recordReadings(
  tx: Tx,
  c: { bikeId: string; siteId: string; serviceItemId: string; recordId: string; taskId: string; date: string },
  values: ReadingValue[],
  user: { id: string; name: string },
  now: Date,
) {
  const templates = (await templatesFor(tx, [c.serviceItemId])).get(c.serviceItemId) ?? [];
  const byId = new Map(values.map((v) => [v.templateId, v]));
  const missing = templates.filter((t) => {
    const v = byId.get(t.id);
    return !v || (t.kind === 'measure' ? v.value == null : t.kind === 'check' ? v.done == null : v.dateValue == null);
  });
  if (missing.length)
    throw badRequest(`Record every reading on the card. Missing: ${missing.map((m) => m.label).join(', ')}.`, missing.map((m) => ({ path: `readings.${m.id}`, message: 'No value.' })));
  const unknown = values.filter((v) => !templates.some((t) => t.id === v.templateId));
  if (unknown.length) throw badRequest('Some readings do not belong to this service item.', unknown.map((u) => ({ path: `readings.${u.templateId}`, message: 'Unknown reading.' })));
  const unsafe: string[] = [];
  const rows = templates.map((t) => {
    const v = byId.get(t.id)!;
    const out = t.kind === 'measure' ? outsideLimits(v.value!, t) : t.kind === 'check' ? v.done === false : false;
    if (out && t.safetyCritical) unsafe.push(`${t.label} ${t.kind === 'measure' ? `${v.value} ${t.unit ?? ''}`.trim() : 'not done'} (limit ${describeLimit(t, t.unit)})`);
    return {
      serviceRecordId: c.recordId,
      templateId: t.id,
      label: t.label,
      kind: t.kind,
      unit: t.unit,
      value: v.value ?? null,
      done: v.done ?? null,
      dateValue: v.dateValue ?? null,
      min: t.min,
      max: t.max,
      outOfLimits: out,
      safetyCritical: t.safetyCritical,
    };
  });
  if (rows.length) await tx.insert(serviceReadings).values(rows);
  if (!unsafe.length) return { grounded: false };
  const reason = `Outside a safety limit on ${c.date}: ${unsafe.join('; ')}. Do not ride until repaired and signed off.`;
  const [bike] = await tx.update(bikes).set({ status: 'out_of_service', statusReason: reason, updatedAt: now }).where(eq(bikes.id, c.bikeId)).returning({ fleetNumber: bikes.fleetNumber });
  await audit(tx, { userId: user.id, action: 'grounded', entity: 'bike', entityId: c.bikeId, changes: { status: [null, 'out_of_service'], reason, taskId: c.taskId } });
  await tellSiteManagers(
    tx,
    {
      siteId: c.siteId,
      subject: `${bike.fleetNumber} grounded: reading outside a safety limit`,
      text: `${user.name} recorded a reading outside a safety limit on ${bike.fleetNumber}:\n\n${unsafe.join('\n')}\n\nThe bike is out of service until repaired and returned to service.`,
      key: `limit:${c.recordId}`,
    },
    now,
  );
  return { grounded: true };
}
