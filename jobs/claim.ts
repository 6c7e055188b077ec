import { and, eq, sql } from 'drizzle-orm';
import { CronExpressionParser } from 'cron-parser';
import type { Db } from '../server/db/client';
import { jobRuns } from '../server/db/schema';

/**
 * Claims one run of a job for one time slot. The first instance to insert the row runs the job;
 * every other instance, a restart or a second scan finds the row and does nothing. A unique key
 * works the same on PGlite, PostgreSQL and engines without advisory locks.
 */
export async function claimSlot(db: Db, job: string, slot: string, now: Date) {
  // A run that started long ago and never finished died with its process (a scan killed halfway):
  // the slot may be claimed again, once, by whoever gets there first.
  const stale = new Date(now.getTime() - STALE_AFTER_MS);
  const rows = await db
    .insert(jobRuns)
    .values({ job, slot, startedAt: now })
    .onConflictDoUpdate({ target: [jobRuns.job, jobRuns.slot], set: { startedAt: now }, setWhere: sql`${jobRuns.finishedAt} is null and ${jobRuns.startedAt} < ${stale}` })
    .returning({ job: jobRuns.job });
  return rows.length > 0;
}

export const STALE_AFTER_MS = 30 * 60_000;

export async function finishSlot(db: Db, job: string, slot: string, result: unknown, now: Date) {
  await db.update(jobRuns).set({ finishedAt: now, result }).where(and(eq(jobRuns.job, job), eq(jobRuns.slot, slot)));
}

/** The scheduled instant at or before `now` for a cron expression in a time zone: the slot a tick belongs to. */
export function currentSlot(cron: string, timeZone: string, now: Date): string {
  const expr = CronExpressionParser.parse(cron, { currentDate: new Date(now.getTime() + 1000), tz: timeZone });
  return expr.prev().toISOString()!;
}
