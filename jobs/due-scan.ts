import type { JobDeps, JobResult } from './types';
import { loadDueInputs } from '../server/services/due-data';
import { applyDue, computeAll } from '../server/services/due';
import { valveWarningsForScan } from '../server/services/valve-warnings';
import { runPlan } from '../server/services/workshop-plan';
import { sites } from '../server/db/schema';

/**
 * The due scan: every bike × service item through computeDue, results stored, one task per
 * due cycle raised, bikes with overdue safety-critical work grounded. Safe to run twice or at once.
 */
export async function scan(deps: JobDeps): Promise<JobResult> {
  const now = deps.now();
  const started = Date.now();
  const inputs = await loadDueInputs(deps.db, now);
  const computed = computeAll(inputs);
  // Valve trends do not depend on due states: read before the one transaction that writes everything.
  const warnings = await valveWarningsForScan(deps.db, inputs);
  const report = await deps.db.transaction((tx) => applyDue(tx, computed, now, new Set(warnings.map((w) => w.bikeId))));
  const counts = { overdue: 0, soon: 0, ok: 0 };
  for (const c of computed) counts[c.result.status]++;
  const ms = Date.now() - started;
  return {
    summary: `Scanned ${inputs.bikes.length} bikes, ${report.computed} items (${counts.overdue} overdue, ${counts.soon} due soon): ${report.tasksRaised} new tasks, ${report.earlyValveChecks} early valve checks for closing valves, ${report.bikesGrounded} bikes grounded, in ${ms} ms.`,
    bikes: inputs.bikes.length,
    ...counts,
    ...report,
    valveWarnings: warnings.length,
    ms,
  };
}

/** The nightly job: the scan, then the workshop plan of every site, so new tasks get a visit at once. */
export async function run(deps: JobDeps): Promise<JobResult> {
  const scanned = await scan(deps);
  const siteIds = (await deps.db.select({ id: sites.id }).from(sites)).map((s) => s.id);
  const plan = await runPlan(deps.db, { siteIds, why: 'nightly due scan', now: deps.now() });
  return {
    ...scanned,
    summary: `${scanned.summary} Plan: ${plan.visits} visits, ${plan.unplaced} tasks not placed, in ${plan.ms} ms.`,
    planVisits: plan.visits,
    planUnplaced: plan.unplaced,
    planMs: plan.ms,
  };
}
