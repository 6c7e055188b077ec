import { and, eq } from 'drizzle-orm';
import { CronExpressionParser } from 'cron-parser';
import type { Db } from '../server/db/client';
import { jobRuns } from '../server/db/schema';

/**
 * Claims one run of a job for one time slot. The first instance to insert the row runs the job;
 * every other instance, a restart or a second scan finds the row and does nothing. A unique key
 * works the same on PGlite, PostgreSQL and engines without advisory locks.
 */
export async function claimSlot(db: Db, job: string, slot: string, now: Date) {
  const rows = await db.insert(jobRuns).values({ job, slot, startedAt: now }).onConflictDoNothing().returning({ job: jobRuns.job });
  return rows.length > 0;
}

export async function finishSlot(db: Db, job: string, slot: string, result: unknown, now: Date) {
  await db.update(jobRuns).set({ finishedAt: now, result }).where(and(eq(jobRuns.job, job), eq(jobRuns.slot, slot)));
}

/** The scheduled instant at or before `now` for a cron expression in a time zone: the slot a tick belongs to. */
export function currentSlot(cron: string, timeZone: string, now: Date): string {
  const expr = CronExpressionParser.parse(cron, { currentDate: new Date(now.getTime() + 1000), tz: timeZone });
  return expr.prev().toISOString()!;
}
