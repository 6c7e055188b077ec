// The planner's working state: who and what is busy when, and where one visit could go next.
import type { Interval, PlanBay, PlanBike, PlanInput, PlanSite, PlanTask, PlanTechnician } from './plan-types';
import { Cover, DAY, HOUR, Lane, ceilGrid, overlapMs, union } from './planner-timeline';

/** Tasks of one bike that go into the workshop together. */
export interface VisitGroup {
  key: string;
  bikeId: string;
  taskIds: string[];
  tasks: PlanTask[];
  minutes: number;
  latestDate: string;
  /** The end of latestDate at the site. */
  deadline: number;
}

export interface Spot {
  start: number;
  end: number;
  bayId: string;
  technicianId: string;
  siteId: string;
}

/** Which constraints a search leaves out (to find out which one stands in the way). */
export interface Ignore {
  busy?: boolean;
  cover?: boolean;
  bookings?: boolean;
}

/** Days late of one item finished at `end`: whole days (or part days) past the end of its due day. */
export const lateDays = (task: PlanTask, end: number) => (end <= task.deadline ? 0 : Math.ceil((end - task.deadline) / DAY));

/**
 * An item left out of the plan counts as late to the end of the horizon plus one day, and at least one
 * day, so placing open work anywhere in the horizon always beats leaving it out.
 */
export const unplacedDays = (task: PlanTask, to: number) => Math.max(1, Math.ceil((to - task.deadline) / DAY) + 1);

export const coverKey = (siteId: string, modelId: string) => `${siteId}|${modelId}`;
export const loadKey = (siteId: string, technicianId: string) => `${siteId}|${technicianId}`;

export class PlanState {
  readonly sites = new Map<string, PlanSite>();
  readonly bikes = new Map<string, PlanBike>();
  readonly baysBySite = new Map<string, PlanBay[]>();
  readonly techsBySite = new Map<string, PlanTechnician[]>();
  readonly bayLane = new Map<string, Lane>();
  readonly techLane = new Map<string, Lane>();
  readonly bookingLane = new Map<string, Lane>();
  readonly bikeVisitLane = new Map<string, Lane>();
  readonly cover = new Map<string, Cover>();
  /** Per model at a site, when at least one of its bookings runs (merged). */
  readonly demandTimes = new Map<string, Interval[]>();
  readonly load = new Map<string, number>();
  readonly placed = new Map<string, Spot>();

  constructor(readonly input: PlanInput) {
    for (const s of input.sites) {
      this.sites.set(s.id, s);
      this.baysBySite.set(s.id, []);
      this.techsBySite.set(s.id, []);
    }
    for (const b of input.bays) {
      this.baysBySite.get(b.siteId)?.push(b);
      this.bayLane.set(b.id, new Lane());
    }
    for (const t of input.technicians) {
      const shifts = [...t.shifts].sort((a, b) => a.start - b.start || a.end - b.end);
      this.techsBySite.get(t.siteId)?.push({ ...t, shifts });
      if (!this.techLane.has(t.id)) this.techLane.set(t.id, new Lane());
      if (shifts.length) this.load.set(loadKey(t.siteId, t.id), 0);
    }
    for (const b of input.bikes) {
      this.bikes.set(b.id, b);
      const lane = new Lane();
      for (const k of b.bookings) lane.add({ start: k.start, end: k.end, ref: k.bookingId, kind: 'booking' });
      this.bookingLane.set(b.id, lane);
      this.bikeVisitLane.set(b.id, new Lane());
    }
    for (const f of input.fixed) {
      const busy = { start: f.start, end: f.end, ref: f.id, kind: 'visit' as const };
      this.bayLane.get(f.bayId)?.add(busy);
      this.techLane.get(f.technicianId)?.add(busy);
      this.bikeVisitLane.get(f.bikeId)?.add(busy);
      const k = loadKey(f.siteId, f.technicianId);
      if (this.load.has(k)) this.load.set(k, this.load.get(k)! + (f.end - f.start) / 60_000);
    }
    const byGroup = new Map<string, typeof input.demands>();
    for (const d of input.demands) {
      const k = coverKey(d.siteId, d.modelId);
      byGroup.set(k, [...(byGroup.get(k) ?? []), d]);
    }
    for (const [k, demands] of byGroup) {
      const members = input.bikes.filter((b) => b.available && coverKey(b.siteId, b.modelId) === k);
      const cover = new Cover(members.length);
      for (const d of demands) cover.add(d.start, d.end, -d.quantity, d.quantity);
      for (const b of members) {
        const away = union([...b.bookings, ...input.fixed.filter((f) => f.bikeId === b.id)]);
        for (const i of away) cover.add(i.start, i.end, -1);
      }
      this.cover.set(k, cover);
      this.demandTimes.set(k, union(demands));
    }
  }

  siteOf(g: VisitGroup): string | undefined {
    return this.bikes.get(g.bikeId)?.siteId;
  }

  /** Hours the visit keeps an in-service bike away while its model is booked at its site. */
  bookedLoss(g: VisitGroup, start: number, end: number): number {
    const bike = this.bikes.get(g.bikeId);
    if (!bike?.available) return 0;
    const times = this.demandTimes.get(coverKey(bike.siteId, bike.modelId));
    return times ? overlapMs(start, end, times) / HOUR : 0;
  }

  place(g: VisitGroup, spot: Spot): void {
    const busy = { start: spot.start, end: spot.end, ref: g.key, kind: 'visit' as const };
    this.bayLane.get(spot.bayId)!.add(busy);
    this.techLane.get(spot.technicianId)!.add(busy);
    this.bikeVisitLane.get(g.bikeId)!.add(busy);
    this.coverOf(g)?.add(spot.start, spot.end, -1);
    const k = loadKey(spot.siteId, spot.technicianId);
    this.load.set(k, (this.load.get(k) ?? 0) + g.minutes);
    this.placed.set(g.key, spot);
  }

  unplace(g: VisitGroup): Spot | undefined {
    const spot = this.placed.get(g.key);
    if (!spot) return undefined;
    this.bayLane.get(spot.bayId)!.remove(g.key);
    this.techLane.get(spot.technicianId)!.remove(g.key);
    this.bikeVisitLane.get(g.bikeId)!.remove(g.key);
    this.coverOf(g)?.add(spot.start, spot.end, 1);
    const k = loadKey(spot.siteId, spot.technicianId);
    this.load.set(k, this.load.get(k)! - g.minutes);
    this.placed.delete(g.key);
    return spot;
  }

  private readonly coverByBike = new Map<string, Cover | undefined>();
  private coverOf(g: VisitGroup): Cover | undefined {
    if (!this.coverByBike.has(g.bikeId)) {
      const bike = this.bikes.get(g.bikeId)!;
      this.coverByBike.set(g.bikeId, bike.available ? this.cover.get(coverKey(bike.siteId, bike.modelId)) : undefined);
    }
    return this.coverByBike.get(g.bikeId);
  }

  /** The earliest spot inside one shift of `tech`, starting at or after `from`. */
  searchShift(g: VisitGroup, tech: PlanTechnician, shift: Interval, from: number, ignore: Ignore = {}): Spot | undefined {
    const dur = g.minutes * 60_000;
    const bays = this.baysBySite.get(tech.siteId) ?? [];
    if (!bays.length || shift.end - shift.start < dur) return undefined;
    const bike = this.bikes.get(g.bikeId);
    if (!bike) return undefined;
    const cover = ignore.cover || tech.siteId !== bike.siteId ? undefined : this.coverOf(g);
    const last = Math.min(shift.end, this.input.to) - dur;
    let s = ceilGrid(Math.max(shift.start, from, this.input.from));
    while (s <= last) {
      const e = s + dur;
      const hit =
        (ignore.bookings ? undefined : this.bookingLane.get(bike.id)!.conflict(s, e)) ??
        (ignore.busy ? undefined : this.bikeVisitLane.get(bike.id)!.conflict(s, e) ?? this.techLane.get(tech.id)!.conflict(s, e));
      if (hit) {
        s = ceilGrid(hit.end);
        continue;
      }
      let bayId: string | undefined;
      let freeAt = Infinity;
      for (const bay of bays) {
        const c = ignore.busy ? undefined : this.bayLane.get(bay.id)!.conflict(s, e);
        if (!c) {
          bayId = bay.id;
          break;
        }
        freeAt = Math.min(freeAt, c.end);
      }
      if (!bayId) {
        s = ceilGrid(freeAt);
        continue;
      }
      const blocked = cover?.blocked(s, e);
      if (blocked) {
        s = ceilGrid(blocked.end);
        continue;
      }
      return { start: s, end: e, bayId, technicianId: tech.id, siteId: tech.siteId };
    }
    return undefined;
  }

  /** The earliest spot with any technician at `siteId` (the bike's own site unless told). */
  earliest(g: VisitGroup, ignore: Ignore = {}, siteId = this.siteOf(g), from = this.input.from): Spot | undefined {
    let best: Spot | undefined;
    for (const tech of siteId ? (this.techsBySite.get(siteId) ?? []) : []) {
      for (const shift of tech.shifts) {
        if (best && shift.start >= best.start) break;
        if (shift.end <= from) continue;
        const spot = this.searchShift(g, tech, shift, from, ignore);
        if (spot && (!best || spot.start < best.start)) best = spot;
        if (spot) break;
      }
    }
    return best;
  }

  /**
   * Where the visit could go: in every shift of every technician at its site, the earliest spot and,
   * when that one keeps a booked model's bike away, the earliest spot after that booking.
   */
  candidates(g: VisitGroup): Spot[] {
    const siteId = this.siteOf(g);
    const out: Spot[] = [];
    // After the last item's due day every spot is late, and later only worse: the first one is enough.
    const due = Math.max(...g.tasks.map((t) => t.deadline));
    for (const tech of siteId ? (this.techsBySite.get(siteId) ?? []) : []) {
      for (const shift of tech.shifts) {
        const spot = this.searchShift(g, tech, shift, shift.start);
        if (!spot) continue;
        out.push(spot);
        if (spot.end > due) break;
        if (this.bookedLoss(g, spot.start, spot.end) > 0) {
          const bike = this.bikes.get(g.bikeId)!;
          const times = this.demandTimes.get(coverKey(bike.siteId, bike.modelId)) ?? [];
          const clash = times.find((i) => i.start < spot.end && i.end > spot.start);
          const later = clash ? this.searchShift(g, tech, shift, clash.end) : undefined;
          if (later) out.push(later);
        }
      }
    }
    return out;
  }

  /** Largest less smallest planned minutes among the site's technicians, with `extra` minutes added to one. */
  spread(siteId: string, extra?: { technicianId: string; minutes: number }): number {
    let max = -Infinity;
    let min = Infinity;
    for (const tech of this.techsBySite.get(siteId) ?? []) {
      const k = loadKey(siteId, tech.id);
      if (!this.load.has(k)) continue;
      const m = this.load.get(k)! + (extra && extra.technicianId === tech.id ? extra.minutes : 0);
      max = Math.max(max, m);
      min = Math.min(min, m);
    }
    return max === -Infinity ? 0 : max - min;
  }
}
