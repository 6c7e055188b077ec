import type { Db } from '../db/client';

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

/**
 * Re-plans after a change has committed. Call it after the writing transaction, never inside it.
 * A failed re-plan never fails the write that caused it: the previous plan stays, and the error is logged.
 */
export async function replanAfter(db: Db, change: PlanChange, now: Date): Promise<void> {
  if (!replanner) return;
  try {
    await replanner(db, change, now);
  } catch (err) {
    console.error(`[plan] re-plan after ${change.why} failed; the previous plan stays:`, err);
  }
}
