/**
 * What the coming weeks of service work will use, per part and site.
 *
 * Each bike's riding is simulated day by day, drawing each day's distance from that bike's own
 * recent days (a bootstrap of its daily distance), many times over. Every run says on which day
 * each of its service items falls due (km or calendar, whichever first, and again after each
 * service), or on the day the workshop plan has placed it; the parts of that service are counted
 * in that day's week. The likely (P50) and cautious (P90) figures are quantiles over the runs, so
 * a fleet of steady riders gives a narrow band and a few very busy bikes a wide one.
 */
import { addDaysIso, addMonthsIso, daysBetween, toUtcDate, type IsoDate } from './dates';
import { createRng } from './prng';

export interface ForecastPartUse {
  partId: string;
  quantity: number;
  /** The part of services that use it (1: every time; 0.25: pads at one inspection in four). */
  share: number;
}

export interface ForecastItemInput {
  serviceItemId: string;
  everyKm: number | null;
  everyMonths: number | null;
  /** Where the next service falls due now (km on the continuous scale; calendar date). */
  nextDueKm: number | null;
  nextDueDate: IsoDate | null;
  /** The day the workshop plan (or an open task's due date) puts the next service on. */
  plannedDate: IsoDate | null;
  parts: readonly ForecastPartUse[];
}

export interface ForecastBikeInput {
  bikeId: string;
  siteId: string;
  currentKm: number;
  /** Distances of the bike's recent days, one per day (idle days are zeros). Empty: it is not ridden. */
  dailyKm: readonly number[];
  items: readonly ForecastItemInput[];
}

export interface ForecastOptions {
  today: IsoDate;
  weeks: number;
  /** Simulated runs; more gives steadier quantiles. */
  runs?: number;
  seed?: string;
}

export interface ForecastLineSamples {
  partId: string;
  siteId: string;
  /** runs × days: what run r uses on day d is at [r * days + d]. */
  perRunDay: Float64Array;
}

export interface ForecastSamples {
  today: IsoDate;
  /** Monday of each week, the first being this week. */
  weekStarts: IsoDate[];
  /** Days simulated, today first: the rest of this week and the full weeks after it. */
  days: number;
  /** Days from this week's Monday to today. */
  offset: number;
  runs: number;
  lines: ForecastLineSamples[];
}

export const DEFAULT_FORECAST_RUNS = 100;

/** Monday of the ISO week holding `date`. */
export function weekStartOf(date: IsoDate): IsoDate {
  const dow = toUtcDate(date).getUTCDay();
  return addDaysIso(date, -((dow + 6) % 7));
}

/** The p-quantile of sorted values with linear interpolation between order statistics (type 7, numpy's default). */
export function quantileSorted(sorted: ArrayLike<number>, p: number): number {
  if (!sorted.length) throw new Error('A quantile needs at least one value.');
  if (p < 0 || p > 1) throw new Error('A quantile lies between 0 and 1.');
  const h = (sorted.length - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.ceil(h);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}

function sortedCopy(values: ArrayLike<number>): Float64Array {
  return Float64Array.from(values).sort();
}

/** Simulates the fleet's service work and what it uses: the raw runs, from which every figure comes. */
export function simulatePartUse(bikes: readonly ForecastBikeInput[], o: ForecastOptions): ForecastSamples {
  const runs = o.runs ?? DEFAULT_FORECAST_RUNS;
  const weekStart = weekStartOf(o.today);
  const offset = daysBetween(weekStart, o.today);
  const days = o.weeks * 7 - offset;
  const weekStarts = Array.from({ length: o.weeks }, (_, i) => addDaysIso(weekStart, 7 * i));
  const lineIndex = new Map<string, number>();
  const lines: ForecastLineSamples[] = [];
  const lineOf = (partId: string, siteId: string) => {
    const key = `${partId}|${siteId}`;
    let i = lineIndex.get(key);
    if (i === undefined) {
      i = lines.length;
      lineIndex.set(key, i);
      lines.push({ partId, siteId, perRunDay: new Float64Array(runs * days) });
    }
    return i;
  };
  // Day (from today) on which a service done on day d falls due again by the calendar.
  const monthsOn = new Map<number, number>();
  const calendarNext = (d: number, months: number) => {
    const k = months * 4096 + d;
    let v = monthsOn.get(k);
    if (v === undefined) {
      v = daysBetween(o.today, addMonthsIso(addDaysIso(o.today, d), months));
      monthsOn.set(k, v);
    }
    return v;
  };
  const cum = new Float64Array(days);
  for (const bike of bikes) {
    const items = bike.items.filter((i) => i.parts.length);
    if (!items.length || days <= 0) continue;
    const uses = items.map((i) => i.parts.map((p) => ({ line: lineOf(p.partId, bike.siteId), quantity: p.quantity, share: p.share })));
    const startKm = items.map((i) => i.nextDueKm);
    const startDay = items.map((i) => (i.nextDueDate ? daysBetween(o.today, i.nextDueDate) : Infinity));
    const planned = items.map((i) => (i.plannedDate ? Math.max(0, daysBetween(o.today, i.plannedDate)) : null));
    const rng = createRng(`${o.seed ?? 'forecast'}:${bike.bikeId}`);
    const n = bike.dailyKm.length;
    for (let r = 0; r < runs; r++) {
      let km = bike.currentKm;
      for (let d = 0; d < days; d++) {
        if (n) km += bike.dailyKm[Math.floor(rng.next() * n)];
        cum[d] = km;
      }
      const base = r * days;
      for (let k = 0; k < items.length; k++) {
        const item = items[k];
        let nextKm = startKm[k];
        let nextDay = startDay[k];
        let plan = planned[k];
        let from = 0;
        for (;;) {
          let day: number;
          if (plan !== null) day = plan;
          else {
            // The first day whose end-of-day distance reaches the km due (cum only rises).
            let kmDay = Infinity;
            if (nextKm !== null) {
              if (cum[days - 1] >= nextKm) {
                let lo = from;
                let hi = days - 1;
                while (lo < hi) {
                  const mid = (lo + hi) >> 1;
                  if (cum[mid] >= nextKm) hi = mid;
                  else lo = mid + 1;
                }
                kmDay = lo;
              }
            }
            day = Math.max(from, Math.min(kmDay, nextDay));
          }
          if (!(day < days)) break;
          for (const u of uses[k]) {
            const q = u.share >= 1 || rng.next() < u.share ? u.quantity : 0;
            if (q) lines[u.line].perRunDay[base + day] += q;
          }
          plan = null;
          nextKm = item.everyKm ? cum[day] + item.everyKm : null;
          nextDay = item.everyMonths ? calendarNext(day, item.everyMonths) : Infinity;
          if (nextKm === null && nextDay === Infinity) break;
          from = day + 1;
        }
      }
    }
  }
  lines.sort((a, b) => (a.siteId === b.siteId ? (a.partId < b.partId ? -1 : 1) : a.siteId < b.siteId ? -1 : 1));
  return { today: o.today, weekStarts, days, offset, runs, lines };
}

/** Each week's total in every run: weekTotals(...)[w][r]. */
export function weekTotals(s: ForecastSamples, line: ForecastLineSamples): number[][] {
  const out = s.weekStarts.map(() => new Array<number>(s.runs).fill(0));
  for (let r = 0; r < s.runs; r++)
    for (let d = 0; d < s.days; d++) {
      const v = line.perRunDay[r * s.days + d];
      if (v) out[Math.floor((s.offset + d) / 7)][r] += v;
    }
  return out;
}

/** Each run's total from today to the end of day `upTo − 1`. */
export function runTotals(s: ForecastSamples, line: ForecastLineSamples, upTo: number): Float64Array {
  const out = new Float64Array(s.runs);
  const end = Math.min(upTo, s.days);
  for (let r = 0; r < s.runs; r++) {
    let t = 0;
    for (let d = 0; d < end; d++) t += line.perRunDay[r * s.days + d];
    out[r] = t;
  }
  return out;
}

export interface WeekNeed {
  weekStart: IsoDate;
  p50: number;
  p90: number;
  /** Need from today to the end of this week, each quantile taken over the runs' running totals. */
  cumulativeP50: number;
  cumulativeP90: number;
}

const round3 = (v: number) => Math.round(v * 1000) / 1000;

export function weeklyNeed(s: ForecastSamples, line: ForecastLineSamples): WeekNeed[] {
  const totals = weekTotals(s, line);
  const running = new Float64Array(s.runs);
  return totals.map((week, w) => {
    for (let r = 0; r < s.runs; r++) running[r] += week[r];
    const sorted = sortedCopy(week);
    const cum = sortedCopy(running);
    return {
      weekStart: s.weekStarts[w],
      p50: round3(quantileSorted(sorted, 0.5)),
      p90: round3(quantileSorted(sorted, 0.9)),
      cumulativeP50: round3(quantileSorted(cum, 0.5)),
      cumulativeP90: round3(quantileSorted(cum, 0.9)),
    };
  });
}

/** The cautious need over the next `days` days (lead time): P90 of the runs' totals. */
export function needWithin(s: ForecastSamples, line: ForecastLineSamples, days: number, p = 0.9): number {
  if (days <= 0) return 0;
  if (days > s.days) {
    // Beyond the horizon: the simulated pace carried on in proportion.
    return round3((quantileSorted(sortedCopy(runTotals(s, line, s.days)), p) * days) / s.days);
  }
  return round3(quantileSorted(sortedCopy(runTotals(s, line, days)), p));
}

/** The first week whose cautious running need passes what is there; null when it lasts the horizon. */
export function runsOutWeek(weeks: readonly WeekNeed[], available: number): IsoDate | null {
  return weeks.find((w) => w.cumulativeP90 > available + 1e-9)?.weekStart ?? null;
}

/** The first day (from today) on which the cautious running need passes what is there; null when it lasts. */
export function runsOutDay(s: ForecastSamples, line: ForecastLineSamples, available: number): number | null {
  const running = new Float64Array(s.runs);
  for (let d = 0; d < s.days; d++) {
    for (let r = 0; r < s.runs; r++) running[r] += line.perRunDay[r * s.days + d];
    if (quantileSorted(sortedCopy(running), 0.9) > available + 1e-9) return d;
  }
  return null;
}

/**
 * A bike's recent days as distances, from its check-ins (continuous km): each stretch between two
 * readings spreads its distance evenly over its days. `windowDays` back from the last reading.
 */
export function dailyDistances(readings: readonly { date: IsoDate; odometerKm: number }[], windowDays = 90): number[] {
  if (readings.length < 2) return [];
  const sorted = [...readings].sort((a, b) => (a.date < b.date ? -1 : a.date > b.date ? 1 : a.odometerKm - b.odometerKm));
  const last = sorted[sorted.length - 1].date;
  const out: number[] = [];
  for (let i = 1; i < sorted.length; i++) {
    const a = sorted[i - 1];
    const b = sorted[i];
    if (daysBetween(b.date, last) >= windowDays) continue;
    const gap = daysBetween(a.date, b.date);
    const km = Math.max(0, b.odometerKm - a.odometerKm);
    if (gap <= 0) {
      // Two readings on one day: that day's riding continues the previous one's.
      if (out.length) out[out.length - 1] += km;
      continue;
    }
    const span = Math.min(gap, windowDays);
    for (let d = 0; d < span; d++) out.push(km / gap);
  }
  return out;
}

/** One bike's odometer a year back: its greatest reading by the start of the window, by its end (the day a year before today), and by the end of the horizon after that. */
export interface YearAgoKm {
  atWindowStart: number | null;
  atYearAgo: number | null;
  atHorizonEnd: number | null;
}

/** Days of recent riding each bike's coming days are drawn from. */
export const RIDING_WINDOW_DAYS = 90;

export const SEASON_FACTOR_LIMITS = { min: 0.25, max: 2 } as const;
/** Fewer bikes with a year of history than this, and the season is not judged. */
export const SEASON_MIN_BIKES = 3;

/**
 * How the coming days will ride against the recent ones, read off the same calendar days a year
 * ago: km per bike-day over the year-ago horizon ÷ km per bike-day over the year-ago window. The
 * forecast draws each bike's coming days from its recent ones, so without this a summer's riding
 * would be carried into the autumn. 1 without enough history; held within 0.25–2 so that one odd
 * year cannot swamp the forecast.
 */
export function seasonalFactor(bikes: readonly YearAgoKm[], windowDays: number, horizonDays: number): number {
  let past = 0;
  let coming = 0;
  let n = 0;
  for (const b of bikes) {
    if (b.atWindowStart === null || b.atYearAgo === null || b.atHorizonEnd === null) continue;
    past += Math.max(0, b.atYearAgo - b.atWindowStart);
    coming += Math.max(0, b.atHorizonEnd - b.atYearAgo);
    n++;
  }
  if (n < SEASON_MIN_BIKES || past <= 0 || windowDays <= 0 || horizonDays <= 0) return 1;
  const f = coming / horizonDays / (past / windowDays);
  return Math.min(SEASON_FACTOR_LIMITS.max, Math.max(SEASON_FACTOR_LIMITS.min, f));
}

/** The three days a year back that `seasonalFactor` reads the odometers at. */
export function yearAgoDays(today: IsoDate, windowDays: number, horizonDays: number) {
  const yearAgo = addDaysIso(today, -365);
  return { windowStart: addDaysIso(yearAgo, -windowDays), yearAgo, horizonEnd: addDaysIso(yearAgo, horizonDays) };
}
