// Time structures the planner searches on: a lane of busy intervals per bay, technician and bike,
// and a step function per model at a site that counts the bikes free for its bookings.
import type { Interval } from './plan-types';
import { mergeIntervals } from './shifts';

/** Visits start on a quarter-hour grid. */
export const QUARTER = 15 * 60_000;
export const HOUR = 3_600_000;
export const DAY = 86_400_000;
export const ceilGrid = (ms: number) => Math.ceil(ms / QUARTER) * QUARTER;

export interface Busy extends Interval {
  /** What holds it: a visit key or id, or a booking id. */
  ref: string;
  kind: 'visit' | 'booking';
}

/** Busy intervals of one resource, sorted by start; they may overlap one another (two bookings of a bike). */
export class Lane {
  private items: Busy[] = [];
  private longest = 0;

  add(b: Busy): void {
    let lo = 0;
    let hi = this.items.length;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      const m = this.items[mid];
      if (m.start < b.start || (m.start === b.start && m.ref < b.ref)) lo = mid + 1;
      else hi = mid;
    }
    this.items.splice(lo, 0, b);
    this.longest = Math.max(this.longest, b.end - b.start);
  }

  remove(ref: string): void {
    const i = this.items.findIndex((b) => b.ref === ref);
    if (i >= 0) this.items.splice(i, 1);
  }

  /** Among the intervals overlapping [start, end), the one that ends last (so a search can jump past it). */
  conflict(start: number, end: number): Busy | undefined {
    const from = start - this.longest;
    let lo = 0;
    let hi = this.items.length;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (this.items[mid].start < from) lo = mid + 1;
      else hi = mid;
    }
    let found: Busy | undefined;
    for (let i = lo; i < this.items.length && this.items[i].start < end; i++) {
      const b = this.items[i];
      if (b.end > start && (!found || b.end > found.end)) found = b;
    }
    return found;
  }

  all(): readonly Busy[] {
    return this.items;
  }
}

/**
 * For one model at one site: on each stretch of time, how many of its bikes are free (in service, not
 * on their own booking, not in the workshop) less how many its bookings there ask for (`slack`), and
 * how many they ask for (`demand`). A workshop visit of one of those bikes needs slack ≥ 1 wherever
 * demand > 0.
 */
export class Cover {
  private times: number[] = [-Infinity];
  private slack: number[];
  private demand: number[] = [0];

  constructor(bikes: number) {
    this.slack = [bikes];
  }

  private at(t: number): number {
    let lo = 0;
    let hi = this.times.length;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (this.times[mid] <= t) lo = mid + 1;
      else hi = mid;
    }
    const i = lo - 1;
    if (this.times[i] === t) return i;
    this.times.splice(i + 1, 0, t);
    this.slack.splice(i + 1, 0, this.slack[i]);
    this.demand.splice(i + 1, 0, this.demand[i]);
    return i + 1;
  }

  add(start: number, end: number, slack: number, demand = 0): void {
    if (end <= start) return;
    const a = this.at(start);
    const b = this.at(end);
    for (let i = a; i < b; i++) {
      this.slack[i] += slack;
      this.demand[i] += demand;
    }
  }

  /** The first stretch inside [start, end) where taking one more bike away would leave too few. */
  blocked(start: number, end: number): { start: number; end: number; free: number; demand: number } | undefined {
    for (const seg of this.segments(start, end)) {
      if (seg.demand > 0 && seg.slack < 1) return { start: seg.start, end: seg.end, free: seg.slack + seg.demand, demand: seg.demand };
    }
    return undefined;
  }

  *segments(start: number, end: number): Generator<{ start: number; end: number; slack: number; demand: number }> {
    let lo = 0;
    let hi = this.times.length;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (this.times[mid] <= start) lo = mid + 1;
      else hi = mid;
    }
    for (let i = lo - 1; i < this.times.length && this.times[i] < end; i++) {
      const segEnd = i + 1 < this.times.length ? this.times[i + 1] : Infinity;
      yield { start: Math.max(start, this.times[i]), end: Math.min(end, segEnd), slack: this.slack[i], demand: this.demand[i] };
    }
  }
}

/** The union of some intervals, sorted and merged (the same merge the shift rules use). */
export const union = (list: readonly Interval[]): Interval[] => mergeIntervals(list);

/** Milliseconds of [start, end) covered by a merged, sorted list. */
export function overlapMs(start: number, end: number, merged: Interval[]): number {
  let ms = 0;
  for (const i of merged) {
    if (i.start >= end) break;
    if (i.end > start) ms += Math.min(end, i.end) - Math.max(start, i.start);
  }
  return ms;
}
