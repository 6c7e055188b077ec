import { createRng, hashSeed, type Rng } from '../shared/domain/prng';
import type { ModelRow, ServiceItemRow } from '../server/demo/scenario';
import type { Cell, TableKey } from './tables';
import { measureValves, makeValves } from './valve-model';

/**
 * One synthetic bike at a time, from seeded randomness: the demo's four models and service plans,
 * riding by season (rental at one site, training at the other), a check-in every day for two years,
 * each service done when it comes due (a few left undone, so some work is late), and a valve check
 * with every valve read at each valve service.
 */

export const HISTORY_DAYS = 730;
const DAY_MS = 86_400_000;
export const dayOf = (iso: string) => Date.parse(`${iso}T00:00:00Z`) / DAY_MS;
const isoOf = (day: number) => new Date(day * DAY_MS).toISOString().slice(0, 10);
const KM_PER_MILE = 1.609344;

export interface FleetContext {
  seed: string;
  today: number;
  models: { row: ModelRow; items: ServiceItemRow[]; weight: number }[];
  sites: { id: string; use: 'rental' | 'training'; share: number; tech: string; desk: string }[];
}
export type Batches = Record<TableKey, Cell[][]>;

// Chance of going out, January to December (the demo's riding pattern).
const RENTAL_OUT = [0.15, 0.15, 0.3, 0.65, 0.75, 0.8, 0.85, 0.85, 0.75, 0.6, 0.25, 0.15];
const TRAINING_OUT = [0.35, 0.4, 0.5, 0.7, 0.8, 0.85, 0.85, 0.8, 0.8, 0.7, 0.5, 0.35];

interface CalendarDay { iso: string; month: number; sunday: boolean; firstOfMarch: boolean }
// Every bike walks the same few thousand days: their dates are worked out once.
const calendar = new Map<number, CalendarDay>();
function cal(day: number): CalendarDay {
  let c = calendar.get(day);
  if (!c) {
    const d = new Date(day * DAY_MS);
    c = { iso: isoOf(day), month: d.getUTCMonth(), sunday: d.getUTCDay() === 0, firstOfMarch: d.getUTCMonth() === 2 && d.getUTCDate() === 1 };
    calendar.set(day, c);
  }
  return c;
}

function addMonths(day: number, months: number): number {
  const d = new Date(day * DAY_MS);
  const m = d.getUTCMonth() + months;
  const last = new Date(Date.UTC(d.getUTCFullYear(), m + 1, 0)).getUTCDate();
  return Date.UTC(d.getUTCFullYear(), m, Math.min(d.getUTCDate(), last)) / DAY_MS;
}

function rideKm(rng: Rng, use: 'rental' | 'training', day: number, factor: number): number {
  const u1 = rng.next();
  const u2 = rng.next();
  const c = cal(day);
  const p = use === 'rental' ? RENTAL_OUT[c.month] : c.sunday ? 0 : TRAINING_OUT[c.month];
  if (u1 >= Math.min(0.95, p * factor)) return 0;
  const season = c.month >= 3 && c.month <= 9;
  const [lo, hi] = use === 'rental' ? (season ? [60, 150] : [30, 90]) : season ? [15, 40] : [10, 30];
  return lo + (hi - lo) * u2;
}

function pickWeighted<T extends { weight?: number; share?: number }>(rng: Rng, list: T[]): T {
  let u = rng.next() * list.reduce((s, x) => s + (x.weight ?? x.share ?? 1), 0);
  for (const x of list) if ((u -= x.weight ?? x.share ?? 1) < 0) return x;
  return list[list.length - 1];
}

/**
 * Row ids made from the bike's number and a running count, in the UUID version-4 layout: unique by
 * construction. Random ids from one 32-bit generator per bike collide at fleet scale (millions of ids
 * drawn from overlapping streams).
 */
export function idMaker(seed: string, index: number) {
  const prefix = hashSeed(seed).toString(16).padStart(8, '0');
  const bike = index.toString(16).padStart(7, '0');
  let n = 0;
  return {
    uuid: () => {
      const c = (n++).toString(16).padStart(15, '0');
      return `${prefix}-${bike.slice(0, 4)}-4${bike.slice(4)}-8${c.slice(0, 3)}-${c.slice(3)}`;
    },
  };
}

const stamp = (day: number, hour: number) => `${cal(day).iso}T${hour}:00:00.000Z`;

export function fleetNumber(index: number, bikes: number) {
  return `SM-${String(index + 1).padStart(bikes >= 10_000 ? 5 : 4, '0')}`;
}

/** Appends one bike and its whole history to the batches. */
export function simulateBike(ctx: FleetContext, index: number, bikes: number, out: Batches) {
  const rng = createRng(`${ctx.seed}/bike/${index}`);
  const ids = idMaker(ctx.seed, index);
  const model = pickWeighted(rng, ctx.models);
  const site = pickWeighted(rng, ctx.sites);
  const unit: 'km' | 'mi' = rng.chance(0.02) ? 'mi' : 'km';
  const f = unit === 'mi' ? KM_PER_MILE : 1;
  const age = HISTORY_DAYS + rng.int(0, 400);
  const start = ctx.today - age;
  const factor = rng.range(0.8, 1.2);
  const inServiceOdometer = rng.int(2, 25);
  const bikeId = ids.uuid();
  const year = new Date(start * DAY_MS).getUTCFullYear();
  out.bikes.push([
    bikeId, fleetNumber(index, bikes), null, `SM ${String(year % 100).padStart(2, '0')}-${100 + (index % 900)}`,
    model.row.id, site.id, unit, isoOf(start), inServiceOdometer, 'in_service',
  ]);

  // Continuous km per day since entry into service; the odometer shows whole units.
  const km = new Float64Array(age + 1);
  let trueKm = inServiceOdometer * f;
  km[0] = inServiceOdometer * f;
  const historyFrom = age - HISTORY_DAYS + 1;
  for (let d = 0; d <= age; d++) {
    if (d > 0) trueKm += rideKm(rng, site.use, start + d, factor);
    const value = Math.round(trueKm / f);
    km[d] = Math.round(value * f * 1e6) / 1e6;
    if (d === 0 || d >= historyFrom) {
      out.odometerReadings.push([
        ids.uuid(), bikeId, cal(start + d).iso, value, unit, km[d], false, d === 0 ? 'setup' : 'check-in',
        d === 0 ? site.tech : site.desk, stamp(start + d, 17),
      ]);
    }
  }
  serviceHistory(model, { bikeId, start, age, km, tech: site.tech }, rng, ids, out);
}

interface BikeTrack { bikeId: string; start: number; age: number; km: Float64Array; tech: string }

/** Each item done once within 10% of its distance or 10 days of its date, Sundays excepted. */
function serviceHistory(model: FleetContext['models'][number], b: BikeTrack, rng: Rng, ids: ReturnType<typeof idMaker>, out: Batches) {
  const valves = makeValves(model.row, rng);
  let lastCheckKm: number | null = null;
  const states = model.items.map((item) => ({
    item,
    lastKm: b.km[0],
    firstDone: false,
    dueDay: item.everyMonths == null ? null : addMonths(b.start, item.everyMonths),
    // A few items the workshop stops doing some weeks before today: late work for the lists.
    stopAt: rng.chance(0.04) ? b.age - rng.int(15, 150) : Infinity,
  }));
  for (let d = 1; d <= b.age; d++) {
    const day = b.start + d;
    const c = cal(day);
    for (const s of states) {
      if (d > s.stopAt) continue;
      const it = s.item;
      let due: boolean;
      if (it.rrule) due = c.firstOfMarch;
      else {
        if (c.sunday) continue;
        const step = s.firstDone ? it.everyKm : (it.firstAtKm ?? it.everyKm);
        due = (step != null && s.lastKm + step - b.km[d] <= step / 10) || (s.dueDay !== null && s.dueDay - day <= 10);
      }
      if (!due) continue;
      s.lastKm = b.km[d];
      s.firstDone = true;
      if (it.everyMonths != null) s.dueDay = addMonths(day, it.everyMonths);
      const recordId = ids.uuid();
      let notes: string | null = null;
      if (it.category === 'valves') {
        const checkId = ids.uuid();
        const readings = measureValves(model.row, valves, lastCheckKm === null ? 0 : b.km[d] - lastCheckKm, rng);
        lastCheckKm = b.km[d];
        out.valveChecks.push([checkId, b.bikeId, c.iso, b.km[d], b.tech, stamp(day, 15)]);
        for (const r of readings) {
          out.valveReadings.push([ids.uuid(), checkId, r.cylinder, r.side, r.position, r.asFoundUm, r.asLeftUm, r.shimBeforeUm, r.shimAfterUm, 'feeler']);
        }
        const adjusted = readings.filter((r) => r.asLeftUm !== null).length;
        notes = adjusted ? `${adjusted} of ${readings.length} valves adjusted back to mid-spec.` : 'All valves within spec.';
      }
      out.serviceRecords.push([recordId, b.bikeId, it.id, c.iso, b.km[d], b.tech, notes, stamp(day, 15)]);
    }
  }
}
