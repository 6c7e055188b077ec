import type { Db } from '../db/client';
import { log } from '../logger';

/** What changed, so the planner re-plans only what it touches. */
export interface PlanChange {
  siteIds: string[];
  /** When the change concerns some bikes only (a check-in, a task closed), just their work is placed again. */
  bikeIds?: string[];
  /** In words, for the log: "check-in of SM-07", "bookings imported". */
  why: string;
}

type Replanner = (db: Db, change: PlanChange, now: Date) => Promise<void>;
let replanner: Replanner | undefined;

/** The plan service registers itself here; the writers of bookings, capacity, check-ins and tasks call replanAfter. */
export function setReplanner(fn: Replanner) {
  replanner = fn;
}

interface Queue {
  running: boolean;
  pending?: { change: PlanChange; now: Date; done: (() => void)[] };
  /** Called once nothing is running or waiting. */
  idle: (() => void)[];
}
const queues = new WeakMap<Db, Queue>();

/** Two changes as one: the sites of both; only some bikes when both name bikes. */
export function mergeChanges(a: PlanChange, b: PlanChange): PlanChange {
  return {
    siteIds: [...new Set([...a.siteIds, ...b.siteIds])],
    bikeIds: a.bikeIds && b.bikeIds && sameSites(a, b) ? [...new Set([...a.bikeIds, ...b.bikeIds])] : undefined,
    why: a.why === b.why ? a.why : `${a.why}; ${b.why}`,
  };
}
const sameSites = (a: PlanChange, b: PlanChange) => a.siteIds.length === b.siteIds.length && a.siteIds.every((s) => b.siteIds.includes(s));

/**
 * Re-plans after a change has committed. Call it after the writing transaction, never inside it.
 * Changes that arrive while a re-plan runs are merged into the next one, so a burst of check-ins
 * costs one or two re-plans, not one each. The promise settles when a re-plan that includes this
 * change has finished. A failed re-plan never fails the write that caused it: the previous plan
 * stays, and the error is logged.
 */
export function replanAfter(db: Db, change: PlanChange, now: Date): Promise<void> {
  if (!replanner || !change.siteIds.length) return Promise.resolve();
  let q = queues.get(db);
  if (!q) queues.set(db, (q = { running: false, idle: [] }));
  const queue = q;
  return new Promise<void>((resolve) => {
    queue.pending = queue.pending
      ? { change: mergeChanges(queue.pending.change, change), now: now > queue.pending.now ? now : queue.pending.now, done: [...queue.pending.done, resolve] }
      : { change, now, done: [resolve] };
    if (!queue.running) void drain(db, queue);
  });
}

async function drain(db: Db, queue: Queue) {
  queue.running = true;
  while (queue.pending) {
    const { change, now, done } = queue.pending;
    queue.pending = undefined;
    try {
      await replanner!(db, change, now);
    } catch (err) {
      log.error({ err, why: change.why }, 'Re-plan failed; the previous plan stays.');
    }
    for (const d of done) d();
  }
  queue.running = false;
  for (const d of queue.idle.splice(0)) d();
}

/**
 * Settles once no re-plan runs or waits for this database: for a shutdown that must not close the
 * database under a re-plan, and for tests that read after a write whose re-plan was not awaited.
 */
export function replanIdle(db: Db): Promise<void> {
  const queue = queues.get(db);
  if (!queue || (!queue.running && !queue.pending)) return Promise.resolve();
  return new Promise<void>((resolve) => queue.idle.push(resolve));
}
