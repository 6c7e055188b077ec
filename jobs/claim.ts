import { randomUUID } from 'node:crypto';
import { and, eq, sql } from 'drizzle-orm';
import { CronExpressionParser } from 'cron-parser';
import type pg from 'pg';
import type { Database, Db } from '../server/db/client';
import { jobRuns } from '../server/db/schema';

/** A run of a job for one time slot, held by this process until it finishes. */
export interface SlotClaim {
  /** Records the result and lets the slot go: nobody runs this slot again. */
  finish(result: unknown, at: Date): Promise<void>;
  /** Lets the slot go unfinished (the job failed): the next claim of the slot runs it again. */
  abandon(error: string): Promise<void>;
}

/**
 * Claims (job, slot) rows in `job_runs`. The first process to insert the row runs the job; every
 * other instance, and any repeat, skips it, unless the process that claimed it is gone: a run
 * killed halfway (the process died with its transaction, so nothing of it was written) is claimed
 * again at once by whoever asks next, typically the catch-up of the restarted server.
 *
 * Whether the claiming process is alive is told without clocks or advisory locks:
 * - On PostgreSQL the claimer holds a row lock on its `job_runs` row, on a connection of its own,
 *   for as long as the job runs. A process that dies loses its connection and with it the lock;
 *   `FOR UPDATE SKIP LOCKED` finds an unfinished row nobody holds, and that run is dead.
 * - On embedded PGlite the server is the only process that can open the data directory (the lock
 *   file), so an unfinished run claimed under another process id (`owner`) belongs to a previous
 *   start of the server and is dead.
 */
export interface SlotClaimer {
  /** This process's id, stored as the owner of the runs it claims. */
  readonly owner: string;
  claim(job: string, slot: string, now: Date): Promise<SlotClaim | null>;
}

export function slotClaimer(database: Pick<Database, 'db' | 'pool'>, owner: string = randomUUID()): SlotClaimer {
  return database.pool ? rowLockClaimer(database.pool, owner) : ownerClaimer(database.db, owner);
}

function ownerClaimer(db: Db, owner: string): SlotClaimer {
  return {
    owner,
    async claim(job, slot, now) {
      const rows = await db
        .insert(jobRuns)
        .values({ job, slot, startedAt: now, owner })
        .onConflictDoUpdate({
          target: [jobRuns.job, jobRuns.slot],
          set: { startedAt: now, owner, result: null },
          setWhere: sql`${jobRuns.finishedAt} is null and ${jobRuns.owner} is distinct from ${owner}`,
        })
        .returning({ job: jobRuns.job });
      if (!rows.length) return null;
      const mine = and(eq(jobRuns.job, job), eq(jobRuns.slot, slot), eq(jobRuns.owner, owner));
      return {
        finish: async (result, at) => void (await db.update(jobRuns).set({ finishedAt: at, result }).where(mine)),
        // Claimed under nobody's id, the slot is free for the next claim, in this process too.
        abandon: async (error) => void (await db.update(jobRuns).set({ owner: null, result: { error } }).where(mine)),
      };
    },
  };
}

const LOCK_MINE = `select 1 from job_runs where job = $1 and slot = $2 and finished_at is null for update skip locked`;

function rowLockClaimer(pool: pg.Pool, owner: string): SlotClaimer {
  return {
    owner,
    async claim(job, slot, now) {
      // The insert commits on its own: inside the held transaction it would make every other
      // instance's insert of the same key wait for the whole run.
      await pool.query(`insert into job_runs (job, slot, started_at, owner) values ($1, $2, $3, $4) on conflict (job, slot) do nothing`, [job, slot, now, owner]);
      const client = await pool.connect();
      // The connection may die while the job runs (the server restarted): the claim is lost with it,
      // which other instances see at once; this process learns it when the job finishes.
      let lost: Error | null = null;
      const onError = (e: Error) => {
        lost ??= e;
      };
      client.on('error', onError);
      let held = false;
      try {
        await client.query('begin');
        // Locked by someone else: that run is alive. Finished: no row. Otherwise it is the row just
        // inserted, or its owner died: the lock makes it ours. The row is not written until the run
        // ends: an uncommitted new version of it would make every other instance's insert above wait.
        const { rows } = await client.query(LOCK_MINE, [job, slot]);
        if (!rows.length) return null;
        held = true;
      } finally {
        if (!held) {
          await client.query('rollback').catch(() => {});
          client.off('error', onError);
          client.release(lost ?? undefined);
        }
      }
      const end = async (text: string, params: unknown[]) => {
        try {
          if (lost) throw new Error(`The claim on ${job} for ${slot} was lost with its database connection (${lost.message}); another instance may run that slot again.`);
          await client.query(text, [job, slot, ...params]);
          await client.query('commit');
        } finally {
          client.off('error', onError);
          // A broken connection is thrown away, not handed back to the pool.
          client.release(lost ?? undefined);
        }
      };
      return {
        finish: (result, at) => end(`update job_runs set finished_at = $3, result = $4, owner = $5 where job = $1 and slot = $2`, [at, JSON.stringify(result), owner]),
        abandon: (error) => end(`update job_runs set result = $3, owner = $4 where job = $1 and slot = $2`, [JSON.stringify({ error }), owner]),
      };
    },
  };
}

/** The scheduled instant at or before `now` for a cron expression in a time zone: the slot a tick belongs to. */
export function currentSlot(cron: string, timeZone: string, now: Date): string {
  const expr = CronExpressionParser.parse(cron, { currentDate: new Date(now.getTime() + 1000), tz: timeZone });
  return expr.prev().toISOString()!;
}
