import cron from 'node-cron';
import type { JobDeps, JobResult } from './types';
import { JOBS, type JobName } from './registry';
import { currentSlot, type SlotClaimer } from './claim';

export interface Schedule {
  job: JobName;
  cron: string;
  timeZone: string;
  /** Catch up a tick missed while the server was down, once, at start-up. */
  catchUp: boolean;
}

/**
 * Runs a scheduled job for the slot a tick belongs to, once across every instance: the instance
 * that inserts the (job, slot) row runs it; the others, and any repeat, skip.
 */
export async function runScheduled(deps: JobDeps, s: Schedule, claims: SlotClaimer): Promise<JobResult | null> {
  const now = deps.now();
  const slot = currentSlot(s.cron, s.timeZone, now);
  const claim = await claims.claim(s.job, slot, now);
  if (!claim) return null;
  if (s.job !== 'deliver-mail') deps.log(`[${s.job}] started for the slot of ${slot}`);
  let result: JobResult;
  try {
    result = await JOBS[s.job](deps);
  } catch (e) {
    await claim.abandon(e instanceof Error ? e.message : String(e)).catch(() => {});
    throw e;
  }
  await claim.finish(result, deps.now());
  deps.log(`[${s.job}] ${result.summary}`);
  return result;
}

/** The only place that talks to node-cron. Returns a stop function. */
export function startScheduler(deps: JobDeps, schedules: Schedule[], claims: SlotClaimer) {
  const tasks = schedules.map((s) =>
    cron.schedule(
      s.cron,
      () => runScheduled(deps, s, claims).catch((e) => deps.log(`[${s.job}] failed: ${e instanceof Error ? e.message : e}`)),
      // noOverlap: a slow run is never overlapped by the next tick in this process.
      { timezone: s.timeZone, noOverlap: true, name: s.job },
    ),
  );
  // In order: the due list mailed after a missed Monday must read the scan that ran just before it.
  const catchUp = (async () => {
    for (const s of schedules.filter((x) => x.catchUp))
      await runScheduled(deps, s, claims).catch((e) => deps.log(`[${s.job}] catch-up failed: ${e instanceof Error ? e.message : e}`));
  })();
  return {
    catchUp,
    stop: async () => {
      for (const t of tasks) await t.stop();
    },
  };
}
