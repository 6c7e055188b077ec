import type {
  bikeModels, bikes, defects, odometerReadings, serviceItems, serviceRecords, shimStock, sites, userSites, users,
  valveChecks, valveReadings,
} from '../db/schema';
import { createRng, type Rng } from '../../shared/domain/prng';
import { round10, serviceValve, type Side, type WearingValve } from './valve-wear';

/**
 * The invented Saltmarsh fleet as plain rows, generated from seeded randomness
 * and dated relative to `today`, so the demo always looks current. Usage is
 * simulated day by day from each bike's in-service date; the workshop then
 * services every item as it comes due. A few bikes carry a built-in story
 * (overdue oil, a tightening valve, a worn tyre…) so every screen has
 * something to show.
 */

// Rows as they will read back, less the columns the database fills in itself.
type Row<T extends { $inferSelect: object }, Auto extends string = 'createdAt'> = Omit<T['$inferSelect'], Auto>;
export type SiteRow = Row<typeof sites>;
export type UserRow = Pick<(typeof users)['$inferSelect'], 'id' | 'email' | 'name' | 'role'>;
export type UserSiteRow = Row<typeof userSites, never>;
export type ModelRow = Row<typeof bikeModels>;
export type ServiceItemRow = Row<typeof serviceItems>;
export type BikeRow = Row<typeof bikes, 'createdAt' | 'updatedAt'>;
export type ReadingRow = Row<typeof odometerReadings>;
export type ServiceRecordRow = Row<typeof serviceRecords>;
export type ValveCheckRow = Row<typeof valveChecks>;
export type ValveReadingRow = Row<typeof valveReadings, never>;
export type DefectRow = Row<typeof defects, never>;
export type ShimStockRow = Row<typeof shimStock, never>;
type Category = ServiceItemRow['category'];

export interface Story {
  /** Cylinder-2 exhaust closing up at every check; leaves spec before its next check. */
  tighteningBike: string;
  tighteningValves: { cylinder: number; side: Side; position: number; asFoundUm: number[]; shimUm: number }[];
  overdueOilByKm: string;
  oilDueByCalendar: string;
  dueSoon: { fleetNumber: string; category: Category }[];
  grounded: string;
  odometerReset: string;
  milesBike: string;
  /** Shim sizes with nothing on the shelf, per site name. */
  shimSizesAtZero: Record<string, number[]>;
}

export interface Scenario {
  today: string;
  historyStart: string;
  sites: SiteRow[];
  users: UserRow[];
  userSites: UserSiteRow[];
  models: ModelRow[];
  serviceItems: ServiceItemRow[];
  bikes: BikeRow[];
  odometerReadings: ReadingRow[];
  serviceRecords: ServiceRecordRow[];
  valveChecks: ValveCheckRow[];
  valveReadings: ValveReadingRow[];
  defects: DefectRow[];
  shimStock: ShimStockRow[];
  story: Story;
}

// ── Calendar days as whole numbers (days since 1970-01-01, UTC) ─────────────
const DAY_MS = 86_400_000;
const dayOf = (iso: string) => Date.parse(`${iso}T00:00:00Z`) / DAY_MS;
const isoOf = (day: number) => new Date(day * DAY_MS).toISOString().slice(0, 10);
const dateOf = (day: number) => new Date(day * DAY_MS);
const monthOf = (day: number) => dateOf(day).getUTCMonth() + 1;
const isSunday = (day: number) => dateOf(day).getUTCDay() === 0;
const isFirstOfMarch = (day: number) => monthOf(day) === 3 && dateOf(day).getUTCDate() === 1;
/** Whole months on, clamped to the end of a short month (31 Aug + 6 months = 28/29 Feb). */
function addMonths(day: number, months: number): number {
  const d = dateOf(day);
  const m = d.getUTCMonth() + months;
  const last = new Date(Date.UTC(d.getUTCFullYear(), m + 1, 0)).getUTCDate();
  return Date.UTC(d.getUTCFullYear(), m, Math.min(d.getUTCDate(), last)) / DAY_MS;
}
/** The day whose `months`-later due date lands on (or nearest) `target`. */
function anchorFor(target: number, months: number): number {
  const guess = addMonths(target, -months);
  let best = guess;
  for (let d = guess - 3; d <= guess + 3; d++) {
    if (Math.abs(addMonths(d, months) - target) < Math.abs(addMonths(best, months) - target)) best = d;
  }
  return best;
}

// ── The operator ─────────────────────────────────────────────────────────────
type SiteKey = 'quay' | 'airfield';
const SITES: { key: SiteKey; name: string; bays: number; use: 'rental' | 'training' }[] = [
  { key: 'quay', name: 'Quay Street', bays: 2, use: 'rental' },
  { key: 'airfield', name: 'Airfield', bays: 1, use: 'training' },
];
const PEOPLE: { name: string; role: UserRow['role']; sites: SiteKey[] }[] = [
  { name: 'Ada Okafor', role: 'admin', sites: ['quay', 'airfield'] },
  { name: 'Imogen Marsh', role: 'manager', sites: ['quay', 'airfield'] },
  { name: 'Tomasz Reed', role: 'technician', sites: ['quay'] },
  { name: 'Priya Vale', role: 'technician', sites: ['airfield'] },
  { name: 'Cal Brennan', role: 'desk', sites: ['quay'] },
  { name: 'Ruth Ibbot', role: 'desk', sites: ['airfield'] },
];

type ModelKey = 'strider' | 'pathfinder' | 'ridgeback' | 'breeze';
interface ModelSpec {
  name: string; cylinders: number; valvesPerSide: number; adjuster: ModelRow['adjuster'];
  intake: [number, number]; exhaust: [number, number];
  valveKm: number; valveMonths: number; valveMinutes: number; chain: boolean; vinCode: string;
}
const MODELS: Record<ModelKey, ModelSpec> = {
  strider: { name: 'Strider 125', cylinders: 1, valvesPerSide: 1, adjuster: 'screw-and-locknut', intake: [50, 90], exhaust: [80, 120], valveKm: 6000, valveMonths: 12, valveMinutes: 60, chain: true, vinCode: 'ST12A' },
  pathfinder: { name: 'Pathfinder 250', cylinders: 1, valvesPerSide: 2, adjuster: 'shim-under-bucket', intake: [100, 150], exhaust: [170, 220], valveKm: 12000, valveMonths: 24, valveMinutes: 90, chain: true, vinCode: 'PF25B' },
  ridgeback: { name: 'Ridgeback 400', cylinders: 2, valvesPerSide: 2, adjuster: 'shim-under-bucket', intake: [100, 200], exhaust: [200, 300], valveKm: 24000, valveMonths: 24, valveMinutes: 150, chain: true, vinCode: 'RB40C' },
  breeze: { name: 'Breeze 125', cylinders: 1, valvesPerSide: 1, adjuster: 'screw-and-locknut', intake: [80, 120], exhaust: [80, 120], valveKm: 6000, valveMonths: 12, valveMinutes: 60, chain: false, vinCode: 'BZ12S' },
};
const SHIM = { min: 1200, max: 3500, step: 50 };
export const PRE_SEASON_RULE = 'FREQ=YEARLY;BYMONTH=3;BYMONTHDAY=1';

type ItemSpec = Omit<ServiceItemRow, 'id' | 'modelId'>;
function itemsFor(m: ModelSpec): ItemSpec[] {
  const item = (s: Partial<ItemSpec> & Pick<ItemSpec, 'name' | 'category' | 'estimatedMinutes'>): ItemSpec =>
    ({ everyKm: null, everyMonths: null, firstAtKm: null, rrule: null, safetyCritical: false, ...s });
  return [
    item({ name: 'Engine oil and filter', category: 'oil', everyKm: 5000, everyMonths: 6, firstAtKm: 1000, estimatedMinutes: 30 }),
    item({ name: 'Valve clearance check', category: 'valves', everyKm: m.valveKm, everyMonths: m.valveMonths, firstAtKm: 1000, estimatedMinutes: m.valveMinutes }),
    ...(m.chain ? [item({ name: 'Chain slack and lube', category: 'chain', everyKm: 1000, estimatedMinutes: 15 })] : []),
    item({ name: 'Brake pads and tyres inspection', category: 'brakes', everyKm: 3000, everyMonths: 3, safetyCritical: true, estimatedMinutes: 20 }),
    item({ name: 'Brake fluid', category: 'brake-fluid', everyMonths: 24, estimatedMinutes: 40 }),
    item({ name: 'Pre-season safety inspection', category: 'inspection', rrule: PRE_SEASON_RULE, safetyCritical: true, estimatedMinutes: 45 }),
  ];
}

// Fleet number, model, site, months since it went into service (older bikes, lower numbers).
const FLEET: [string, ModelKey, SiteKey, number][] = [
  ['SM-01', 'ridgeback', 'quay', 30], ['SM-02', 'ridgeback', 'quay', 30], ['SM-03', 'pathfinder', 'quay', 30],
  ['SM-04', 'strider', 'airfield', 30], ['SM-05', 'pathfinder', 'airfield', 29], ['SM-06', 'ridgeback', 'quay', 29],
  ['SM-07', 'strider', 'quay', 28], ['SM-08', 'breeze', 'airfield', 28], ['SM-09', 'ridgeback', 'quay', 25],
  ['SM-10', 'pathfinder', 'quay', 25], ['SM-11', 'strider', 'airfield', 25], ['SM-12', 'breeze', 'quay', 24],
  ['SM-13', 'ridgeback', 'quay', 24], ['SM-14', 'strider', 'airfield', 24], ['SM-15', 'pathfinder', 'airfield', 23],
  ['SM-16', 'breeze', 'airfield', 22], ['SM-17', 'ridgeback', 'quay', 20], ['SM-18', 'strider', 'quay', 20],
  ['SM-19', 'pathfinder', 'quay', 19], ['SM-20', 'strider', 'airfield', 19], ['SM-21', 'breeze', 'quay', 18],
  ['SM-22', 'ridgeback', 'quay', 12], ['SM-23', 'pathfinder', 'airfield', 9], ['SM-24', 'strider', 'airfield', 6],
];

const TIGHTENING = {
  fleet: 'SM-01', targetKm: 47_000,
  valves: [
    { cylinder: 2, side: 'exhaust' as const, position: 1, asFoundUm: [280, 240, 210], shimUm: 2600 },
    { cylinder: 2, side: 'exhaust' as const, position: 2, asFoundUm: [285, 250, 215], shimUm: 2650 },
  ],
};
const STORY_BIKES = {
  overdueOilByKm: 'SM-10', oilDueByCalendar: 'SM-16', grounded: 'SM-07', odometerReset: 'SM-13', milesBike: 'SM-11',
  brakeFluidSoon: 'SM-12', oilByCalendarSoon: 'SM-14', brakesByCalendarSoon: 'SM-15', chainByKmSoon: 'SM-20',
};
// The sizes the tightening Ridgeback's cylinder-2 exhaust will need, plus a few others.
const SHIMS_AT_ZERO: Record<SiteKey, number[]> = { quay: [1950, 2450, 2500, 2550, 2600], airfield: [2350, 2800] };
const KM_PER_MILE = 1.609344;
const RESET_VALUE = 12;
const round6 = (x: number) => Math.round(x * 1e6) / 1e6;

// ── Riding: how far each bike goes each day ──────────────────────────────────
// Chance of going out, January to December. Training runs Monday to Saturday.
const RENTAL_OUT = [0.15, 0.15, 0.3, 0.65, 0.75, 0.8, 0.85, 0.85, 0.75, 0.6, 0.25, 0.15];
const TRAINING_OUT = [0.35, 0.4, 0.5, 0.7, 0.8, 0.85, 0.85, 0.8, 0.8, 0.7, 0.5, 0.35];
type Mode = 'normal' | 'busy' | 'idle' | 'parked' | 'out';

function rideKm(rng: Rng, use: 'rental' | 'training', day: number, factor: number, mode: Mode): number {
  // Two draws every day, whatever the mode, so a change of factor moves no later draw.
  const u1 = rng.next();
  const u2 = rng.next();
  if (mode === 'parked') return 0;
  if (mode === 'busy') return u1 < 0.9 ? 120 + 30 * u2 : 0;
  if (mode === 'idle') return u1 < 0.07 ? 5 + 20 * u2 : 0;
  const m = monthOf(day);
  const season = m >= 4 && m <= 10;
  const p = use === 'rental' ? RENTAL_OUT[m - 1] : isSunday(day) ? 0 : TRAINING_OUT[m - 1];
  const [lo, hi] = use === 'rental' ? (season ? [60, 150] : [30, 90]) : season ? [15, 40] : [10, 30];
  if (mode !== 'out' && u1 >= Math.min(0.95, p * factor)) return 0;
  return lo + (hi - lo) * Math.min(1, u2 * factor);
}

interface Plan {
  fleet: string; index: number; model: ModelSpec; modelId: string; site: (typeof SITES)[number]; siteId: string;
  unit: 'km' | 'mi'; start: number; n: number; inServiceOdometer: number;
  modeAt: (d: number) => Mode; resetAt: number | null; lastServiceAt: number;
  anchors: Map<Category, number>; neverDo: Set<Category>; notes: Map<string, string>;
}
interface Track { out: boolean[]; value: number[]; km: number[] }

function ride(p: Plan, factor: number): Track {
  const rng = createRng(`${p.fleet}/ride`);
  const f = p.unit === 'mi' ? KM_PER_MILE : 1;
  const t: Track = { out: [false], value: [p.inServiceOdometer], km: [round6(p.inServiceOdometer * f)] };
  let trueKm = p.inServiceOdometer * f;
  let base = { value: 0, km: 0, trueKm: 0 };
  for (let d = 1; d <= p.n; d++) {
    const dist = rideKm(rng, p.site.use, p.start + d, factor, p.modeAt(d));
    trueKm += dist;
    // A replaced instrument starts again low; the continuous distance carries on from the old one.
    if (d === p.resetAt) base = { value: RESET_VALUE, km: t.km[d - 1], trueKm };
    t.out.push(dist > 0);
    t.value.push(base.value + Math.round((trueKm - base.trueKm) / f));
    t.km.push(round6(base.km + (t.value[d] - base.value) * f));
  }
  return t;
}

/** The riding factor that brings a bike to `targetKm` today (distance grows with the factor). */
function factorFor(p: Plan, targetKm: number): number {
  let lo = 0.5;
  let hi = 1.6;
  for (let i = 0; i < 30; i++) {
    const mid = (lo + hi) / 2;
    if (ride(p, mid).km[p.n] < targetKm) lo = mid;
    else hi = mid;
  }
  return hi;
}

// ── Valves ───────────────────────────────────────────────────────────────────
/** Closing-up (`closing`) is mostly seat recession, mostly on exhaust valves. */
interface Valve extends WearingValve {
  script?: number[];
}
function makeValves(p: Plan, rng: Rng): Valve[] {
  const m = p.model;
  const valves: Valve[] = [];
  for (let cylinder = 1; cylinder <= m.cylinders; cylinder++) {
    for (const side of ['intake', 'exhaust'] as const) {
      for (let position = 1; position <= m.valvesPerSide; position++) {
        const [lo, hi] = m[side];
        const closing =
          m === MODELS.ridgeback ? (side === 'intake' ? rng.range(-0.2, 0.2) : cylinder === 2 ? rng.range(1.0, 1.4) : rng.range(0.3, 0.6))
          : m === MODELS.pathfinder ? (side === 'intake' ? rng.range(-0.3, 0.3) : rng.range(0.4, 1.2))
          : side === 'exhaust' ? rng.range(0, 3) : rng.range(-1, 2);
        const shim = m.adjuster === 'shim-under-bucket' ? 2400 + SHIM.step * rng.int(0, 10) : null;
        const scripted = p.fleet === TIGHTENING.fleet
          ? TIGHTENING.valves.find((v) => v.cylinder === cylinder && v.side === side && v.position === position) : undefined;
        valves.push({
          cylinder, side, position, clearance: lo + (hi - lo) * rng.range(0.5, 0.9), closing,
          shim: scripted ? scripted.shimUm : shim, script: scripted?.asFoundUm,
        });
      }
    }
  }
  return valves;
}

/** Nearest shim of the series to `um`, the thinner on a tie (lean loose). */
function nearestShim(um: number): number {
  const lower = Math.floor(um / SHIM.step) * SHIM.step;
  return Math.min(SHIM.max, Math.max(SHIM.min, um - lower > SHIM.step / 2 ? lower + SHIM.step : lower));
}

/** One check: read every valve, bring back to mid-spec any found outside it. */
function measure(p: Plan, valves: Valve[], kmSinceLast: number, nth: number, rng: Rng) {
  return valves.map((v) => {
    v.clearance -= (v.closing * kmSinceLast) / 1000;
    const noise = rng.range(-6, 6);
    const asFoundUm = v.script?.[nth] ?? round10(v.clearance + noise);
    if (v.script) v.clearance = asFoundUm;
    return serviceValve(v, asFoundUm, p.model[v.side], nearestShim);
  });
}

// ── Building it all ──────────────────────────────────────────────────────────
export function buildScenario(today: string): Scenario {
  if (!/^\d{4}-\d{2}-\d{2}$/.test(today) || isoOf(dayOf(today)) !== today) {
    throw new RangeError(`today must be a calendar date as YYYY-MM-DD, got "${today}"`);
  }
  const now = dayOf(today);
  const historyStart = addMonths(now, -18);
  const ids = createRng('saltmarsh/ids');
  const siteRows = SITES.map((s): SiteRow => ({ id: ids.uuid(), name: s.name, timeZone: 'Europe/London', bays: s.bays }));
  const siteId = (k: SiteKey) => siteRows[SITES.findIndex((s) => s.key === k)].id;
  const userRows = PEOPLE.map((u): UserRow => ({
    id: ids.uuid(), name: u.name, role: u.role, email: `${u.name.split(' ')[0].toLowerCase()}@saltmarsh.test`,
  }));
  const userSiteRows = PEOPLE.flatMap((u, i) => u.sites.map((k) => ({ userId: userRows[i].id, siteId: siteId(k) })));
  const staff = (role: UserRow['role'], k: SiteKey) => userRows[PEOPLE.findIndex((u) => u.role === role && u.sites.includes(k))].id;
  const modelRows: ModelRow[] = [];
  const itemRows: ServiceItemRow[] = [];
  const modelIds = new Map<ModelSpec, string>();
  for (const m of Object.values(MODELS)) {
    const id = ids.uuid();
    modelIds.set(m, id);
    const shims = m.adjuster === 'shim-under-bucket';
    modelRows.push({
      id, name: m.name, cylinders: m.cylinders, intakeValvesPerCylinder: m.valvesPerSide, exhaustValvesPerCylinder: m.valvesPerSide,
      adjuster: m.adjuster, intakeMinUm: m.intake[0], intakeMaxUm: m.intake[1], exhaustMinUm: m.exhaust[0], exhaustMaxUm: m.exhaust[1],
      shimMinUm: shims ? SHIM.min : null, shimMaxUm: shims ? SHIM.max : null, shimStepUm: shims ? SHIM.step : null,
    });
    for (const it of itemsFor(m)) itemRows.push({ id: ids.uuid(), modelId: id, ...it });
  }

  const out: Scenario = {
    today, historyStart: isoOf(historyStart), sites: siteRows, users: userRows, userSites: userSiteRows, models: modelRows,
    serviceItems: itemRows, bikes: [], odometerReadings: [], serviceRecords: [], valveChecks: [], valveReadings: [],
    defects: [], shimStock: [], story: {
      tighteningBike: TIGHTENING.fleet, tighteningValves: TIGHTENING.valves.map((v) => ({ ...v, asFoundUm: [...v.asFoundUm] })),
      overdueOilByKm: STORY_BIKES.overdueOilByKm, oilDueByCalendar: STORY_BIKES.oilDueByCalendar,
      dueSoon: [
        { fleetNumber: STORY_BIKES.brakeFluidSoon, category: 'brake-fluid' },
        { fleetNumber: STORY_BIKES.oilByCalendarSoon, category: 'oil' },
        { fleetNumber: STORY_BIKES.brakesByCalendarSoon, category: 'brakes' },
        { fleetNumber: STORY_BIKES.chainByKmSoon, category: 'chain' },
      ],
      grounded: STORY_BIKES.grounded, odometerReset: STORY_BIKES.odometerReset, milesBike: STORY_BIKES.milesBike,
      shimSizesAtZero: Object.fromEntries(SITES.map((s) => [s.name, [...SHIMS_AT_ZERO[s.key]]])),
    },
  };

  FLEET.forEach(([fleet, modelKey, siteKey, monthsAgo], index) => {
    const rng = createRng(`${fleet}/plan`);
    const model = MODELS[modelKey];
    const site = SITES.find((s) => s.key === siteKey)!;
    const start = fleet === STORY_BIKES.brakeFluidSoon ? anchorFor(now + 5, 24) : addMonths(now, -monthsAgo) + rng.int(0, 20);
    const unit = fleet === STORY_BIKES.milesBike ? 'mi' : 'km';
    const n = now - start;
    const p: Plan = {
      fleet, index, model, modelId: modelIds.get(model)!, site, siteId: siteId(siteKey), unit, start, n,
      inServiceOdometer: rng.int(2, unit === 'mi' ? 12 : 25), modeAt: () => 'normal', resetAt: null, lastServiceAt: n,
      anchors: new Map(), neverDo: new Set(), notes: new Map(),
    };
    const factor = rng.range(0.85, 1.15);
    tellStory(p, now);
    const track = ride(p, fleet === TIGHTENING.fleet ? factorFor(p, TIGHTENING.targetKm) : factor);
    if (fleet === STORY_BIKES.chainByKmSoon) p.anchors.set('chain', chainAnchor(track, n));
    emitBike(out, p, track, rng, { tech: staff('technician', siteKey), desk: staff('desk', siteKey) }, ids, historyStart);
  });
  out.shimStock = stockRows(siteId);
  return out;
}

/** Sets the days and rules behind each built-in story. */
function tellStory(p: Plan, now: number) {
  const at = (day: number) => day - p.start;
  switch (p.fleet) {
    case STORY_BIKES.overdueOilByKm: {
      // Oil changed two months ago, then a busy run of daily hires and nobody caught the next one.
      const last = at(now - 62);
      p.anchors.set('oil', last);
      p.modeAt = (d) => (d > last ? 'busy' : 'normal');
      break;
    }
    case STORY_BIKES.oilDueByCalendar: {
      const last = at(anchorFor(now - 4, 6));
      p.anchors.set('oil', last);
      p.modeAt = (d) => (d >= last - 7 ? 'idle' : 'normal');
      break;
    }
    case STORY_BIKES.oilByCalendarSoon: p.anchors.set('oil', at(anchorFor(now + 3, 6))); break;
    case STORY_BIKES.brakesByCalendarSoon: p.anchors.set('brakes', at(anchorFor(now + 6, 3))); break;
    case STORY_BIKES.brakeFluidSoon: p.neverDo.add('brake-fluid'); break;
    case STORY_BIKES.grounded: {
      const g = at(now - 5);
      p.anchors.set('brakes', g);
      p.lastServiceAt = g;
      p.notes.set(`brakes@${g}`, 'Rear tyre tread 0.8 mm, below the 1.0 mm limit: off the road until a new tyre is fitted.');
      p.modeAt = (d) => (d === g ? 'out' : d > g ? 'parked' : 'normal');
      break;
    }
    case STORY_BIKES.odometerReset: {
      const r = at(now - 270);
      p.resetAt = r;
      p.modeAt = (d) => (d === r ? 'parked' : 'normal');
      break;
    }
  }
}

/** The last chain service that leaves about three and a half days of riding before the next. */
function chainAnchor(t: Track, n: number): number {
  const rate = Math.max(1, (t.km[n] - t.km[Math.max(0, n - 28)]) / 28);
  let best = n - 1;
  let bestMiss = Infinity;
  for (let d = Math.max(1, n - 150); d < n; d++) {
    const remaining = t.km[d] + 1000 - t.km[n];
    const miss = Math.abs(remaining / rate - 3.5);
    if (remaining > 0 && miss < bestMiss) [best, bestMiss] = [d, miss];
  }
  return best;
}

function emitBike(
  out: Scenario, p: Plan, t: Track, rng: Rng, who: { tech: string; desk: string }, ids: Rng, historyStart: number,
) {
  const bikeId = ids.uuid();
  const year = dateOf(p.start).getUTCFullYear();
  const grounded = p.fleet === STORY_BIKES.grounded;
  out.bikes.push({
    id: bikeId, fleetNumber: p.fleet, modelId: p.modelId, siteId: p.siteId, odometerUnit: p.unit,
    // Invented identifiers in the ISO 3779 form (17 characters, no I, O or Q), with a
    // model-year letter in the usual 30-year cycle, 2010 = A (from memory).
    vin: rng.chance(0.75) ? `0SX${p.model.vinCode}0${'ABCDEFGHJKLMNPRSTVWXY'[(year - 2010) % 21]}K${204_100 + p.index * 53 + rng.int(0, 40)}` : null,
    registration: `SM ${String(year % 100).padStart(2, '0')}-${100 + ((p.index * 37) % 900)}`,
    inServiceDate: isoOf(p.start), inServiceOdometer: p.inServiceOdometer,
    status: grounded ? 'out_of_service' : 'in_service',
    statusReason: grounded ? 'Rear tyre tread 0.8 mm at last inspection, below the 1.0 mm limit' : null,
  });
  for (let d = 0; d <= p.n; d++) {
    const reading = (source: ReadingRow['source'], recordedBy: string, reset = false) =>
      out.odometerReadings.push({ id: ids.uuid(), bikeId, date: isoOf(p.start + d), value: t.value[d], unit: p.unit, odometerKm: t.km[d], reset, source, recordedBy });
    if (d === 0) reading('setup', who.tech);
    else if (d === p.resetAt) reading('service', who.tech, true);
    else if (t.out[d] && p.start + d >= historyStart) reading('check-in', who.desk);
  }
  serviceHistory(out, p, t, rng, who.tech, bikeId, ids);
  if (grounded) {
    out.defects.push({
      id: ids.uuid(), bikeId, category: 'tyres', safetyCritical: true, reportedBy: who.tech,
      text: 'Rear tyre worn below the legal limit: 0.8 mm of tread at the centre (limit 1.0 mm). Replace before the next hire.',
      reportedAt: new Date((p.start + p.lastServiceAt) * DAY_MS + 15 * 3_600_000), resolvedAt: null,
    });
  }
}

interface ItemState { item: ServiceItemRow; last: number | null }

/** The workshop keeps up: each item is done once it is within 10% of its distance or 10 days of its date. */
function serviceHistory(out: Scenario, p: Plan, t: Track, rng: Rng, tech: string, bikeId: string, ids: Rng) {
  const states: ItemState[] = out.serviceItems.filter((i) => i.modelId === p.modelId).map((item) => ({ item, last: null }));
  const valves = makeValves(p, createRng(`${p.fleet}/valves`));
  let lastCheck: { km: number; nth: number } | null = null;
  const rate = (t.km[p.n] - t.km[Math.max(0, p.n - 28)]) / Math.min(28, Math.max(1, p.n));
  let sweep = p.n - 1;
  while (sweep > 0 && isSunday(p.start + sweep)) sweep--;
  const due = (s: ItemState) => {
    const step = s.last === null ? (s.item.firstAtKm ?? s.item.everyKm) : s.item.everyKm;
    return {
      km: step == null ? null : t.km[s.last ?? 0] + step,
      day: s.item.everyMonths == null ? null : addMonths(p.start + (s.last ?? 0), s.item.everyMonths),
      marginKm: (step ?? 0) / 10,
    };
  };
  const within = (s: ItemState, d: number, kmAhead: number, daysAhead: number) => {
    const x = due(s);
    return (x.km !== null && x.km - t.km[d] <= kmAhead + x.marginKm) || (x.day !== null && x.day - (p.start + d) <= daysAhead);
  };
  const record = (s: ItemState, d: number) => {
    s.last = d;
    const row: ServiceRecordRow = {
      id: ids.uuid(), bikeId, serviceItemId: s.item.id, date: isoOf(p.start + d), odometerKm: t.km[d], taskId: null,
      doneBy: tech, notes: p.notes.get(`${s.item.category}@${d}`) ?? null,
    };
    out.serviceRecords.push(row);
    if (s.item.category !== 'valves') return;
    const checkId = ids.uuid();
    const readings = measure(p, valves, lastCheck ? t.km[d] - lastCheck.km : 0, lastCheck ? lastCheck.nth + 1 : 0, rng);
    lastCheck = { km: t.km[d], nth: lastCheck ? lastCheck.nth + 1 : 0 };
    out.valveChecks.push({ id: checkId, bikeId, taskId: null, date: row.date, odometerKm: t.km[d], checkedBy: tech });
    for (const r of readings) out.valveReadings.push({ id: ids.uuid(), checkId, method: 'feeler', ...r });
    const adjusted = readings.filter((r) => r.asLeftUm !== null).length;
    row.notes = adjusted ? `${adjusted} of ${readings.length} valves adjusted back to mid-spec.` : 'All valves within spec.';
  };
  for (let d = 1; d <= p.lastServiceAt; d++) {
    const day = p.start + d;
    for (const s of states) {
      const c = s.item.category;
      const anchor = p.anchors.get(c);
      if (s.item.rrule) {
        if (isFirstOfMarch(day)) record(s, d);
      } else if (anchor === d) {
        record(s, d);
      } else if (isSunday(day) || p.neverDo.has(c) || (anchor !== undefined && d >= anchor - 20)) {
        continue;
      } else if (within(s, d, 0, 10)) {
        record(s, d);
      } else if (d === sweep && within(s, p.n, rate * 10, 10)) {
        // The last workshop day before today clears whatever would fall due in the coming days.
        record(s, d);
      }
    }
  }
}

function stockRows(siteId: (k: SiteKey) => string): ShimStockRow[] {
  const rows: ShimStockRow[] = [];
  for (const s of SITES) {
    const rng = createRng(`${s.key}/shims`);
    for (let size = SHIM.min; size <= SHIM.max; size += SHIM.step) {
      const common = size >= 2200 && size <= 3000;
      const zero = SHIMS_AT_ZERO[s.key].includes(size);
      rows.push({ siteId: siteId(s.key), sizeUm: size, condition: 'new', count: zero ? 0 : common ? rng.int(1, 4) : rng.int(0, 2), minCount: common ? 1 : 0 });
      if (!zero && common && rng.chance(0.3)) rows.push({ siteId: siteId(s.key), sizeUm: size, condition: 'used', count: rng.int(1, 2), minCount: 0 });
    }
  }
  return rows;
}
