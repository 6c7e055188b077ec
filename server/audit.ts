import type { Db } from './db/client';
import { auditLog } from './db/schema';

export interface AuditEntry {
  userId: string | null;
  action: string;
  entity: string;
  entityId?: string | null;
  changes?: unknown;
}

/** Records who changed what; call it inside the same transaction as the change. */
export async function audit(db: Pick<Db, 'insert'>, e: AuditEntry) {
  await db.insert(auditLog).values({
    userId: e.userId,
    action: e.action,
    entity: e.entity,
    entityId: e.entityId ?? null,
    changes: e.changes ?? null,
  });
}

/** The fields whose values differ, as { field: [before, after] }. */
export function diff<T extends Record<string, unknown>>(before: T, after: Partial<T>) {
  const out: Record<string, [unknown, unknown]> = {};
  for (const [k, v] of Object.entries(after)) if (v !== undefined && before[k] !== v) out[k] = [before[k], v];
  return out;
}
