import { and, asc, eq, sql } from 'drizzle-orm';
import type { DbOrTx } from '../db/client';
import { shimStock, stockMovements } from '../db/schema';
import type { ShimStockLine } from '../../shared/schemas/valves';
import { toMicrons } from '../../shared/domain/microns';

export async function stockAt(db: DbOrTx, siteId: string): Promise<ShimStockLine[]> {
  const rows = await db.select().from(shimStock).where(eq(shimStock.siteId, siteId)).orderBy(asc(shimStock.sizeUm), asc(shimStock.condition));
  return rows.map((r) => ({ sizeMm: r.sizeUm / 1000, condition: r.condition, count: r.count, minCount: r.minCount }));
}

/**
 * Moves stock by `delta` and records why. A count never goes below zero: a shim fitted that the
 * records did not hold (bought in, ground to size) is still recorded as a movement.
 */
export async function moveStock(
  db: DbOrTx,
  m: { siteId: string; sizeMm: number; condition: 'new' | 'used'; delta: number; reason: string; taskId?: string | null; by: string | null; at: Date },
) {
  const sizeUm = toMicrons(m.sizeMm);
  await db
    .insert(shimStock)
    .values({ siteId: m.siteId, sizeUm, condition: m.condition, count: Math.max(0, m.delta) })
    .onConflictDoUpdate({
      target: [shimStock.siteId, shimStock.sizeUm, shimStock.condition],
      set: { count: sql`greatest(0, ${shimStock.count} + ${m.delta})` },
    });
  await db.insert(stockMovements).values({ siteId: m.siteId, sizeUm, condition: m.condition, delta: m.delta, reason: m.reason, taskId: m.taskId ?? null, by: m.by, at: m.at });
}

/** Takes one shim of a size out of stock, used ones first (they are already paid for). */
export async function takeShim(db: DbOrTx, siteId: string, sizeMm: number, reason: string, taskId: string, by: string, at: Date) {
  const sizeUm = toMicrons(sizeMm);
  const [used] = await db
    .select({ count: shimStock.count })
    .from(shimStock)
    .where(and(eq(shimStock.siteId, siteId), eq(shimStock.sizeUm, sizeUm), eq(shimStock.condition, 'used')));
  const condition = used && used.count > 0 ? 'used' : 'new';
  await moveStock(db, { siteId, sizeMm, condition, delta: -1, reason, taskId, by, at });
  return condition;
}

export async function setMinimum(db: DbOrTx, siteId: string, sizeMm: number, minCount: number) {
  await db
    .insert(shimStock)
    .values({ siteId, sizeUm: toMicrons(sizeMm), condition: 'new', count: 0, minCount })
    .onConflictDoUpdate({ target: [shimStock.siteId, shimStock.sizeUm, shimStock.condition], set: { minCount } });
}
