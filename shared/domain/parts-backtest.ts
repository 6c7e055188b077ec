/**
 * How well the parts forecast would have done: stand on a past day (the cut-off), build the forecast
 * from what was known then (due states from the service records, recent riding from the check-ins),
 * and set it against what the service records of the following days actually used.
 *
 * What a service "actually used" is its expected use, quantity × share for each part of its item: the
 * share is the part of services that take the part, so one service with pads at a share of 0.25 counts
 * a quarter of a set. The forecast side is the P50 over the simulated runs, per part.
 */
import { addDaysIso, addMonthsIso, compareIso, daysBetween, type IsoDate } from './dates';
import { dueAtKmFor } from './due';
import {
  RIDING_WINDOW_DAYS, dailyDistances, quantileSorted, runTotals, seasonalFactor, simulatePartUse, weekStartOf, yearAgoDays,
  type ForecastBikeInput, type ForecastItemInput, type ForecastPartUse, type ForecastSamples, type YearAgoKm,
} from './parts-forecast';
import type { KmReading } from './usage';

export interface BacktestBike {
  id: string;
  siteId: string;
  modelId: string;
  /** Going into service, on the continuous km scale. */
  inService: KmReading;
}

export interface BacktestReading extends KmReading {
  bikeId: string;
}

export interface BacktestServiceRecord {
  bikeId: string;
  serviceItemId: string;
  date: IsoDate;
  odometerKm: number;
}

export interface BacktestServiceItem {
  id: string;
  modelId: string;
  everyKm: number | null;
  everyMonths: number | null;
  /** Km after going into service for the first service only. */
  firstAtKm?: number | null;
}

export interface BacktestItemPart extends ForecastPartUse {
  serviceItemId: string;
}

export interface BacktestPart {
  id: string;
  family: string;
}

export interface BacktestHistory {
  today: IsoDate;
  bikes: readonly BacktestBike[];
  readings: readonly BacktestReading[];
  serviceRecords: readonly BacktestServiceRecord[];
  serviceItems: readonly BacktestServiceItem[];
  itemParts: readonly BacktestItemPart[];
  parts: readonly BacktestPart[];
}

export interface BacktestOptions {
  /** Days between the cut-off and today: the forecast covers the days after the cut-off up to today. */
  horizonDays?: number;
  /** Days of check-ins before the cut-off whose riding the forecast draws from. */
  windowDays?: number;
  runs?: number;
  seed?: string;
}

export interface FamilyBacktest {
  family: string;
  forecastP50: number;
  actual: number;
  /** |forecast − actual| / actual; null when nothing was used (no error can be stated). */
  absPctError: number | null;
}

export interface BacktestResult {
  cutoff: IsoDate;
  today: IsoDate;
  horizonDays: number;
  windowDays: number;
  families: FamilyBacktest[];
  /** Mean of the families' absolute percentage errors; null when no family used anything. */
  mape: number | null;
}

export const DEFAULT_BACKTEST_HORIZON_DAYS = 90;
export const DEFAULT_BACKTEST_WINDOW_DAYS = RIDING_WINDOW_DAYS;
export const DEFAULT_BACKTEST_RUNS = 200;

/** A map from key to the rows with that key, in their order. */
function groupBy<T>(rows: readonly T[], key: (row: T) => string): Map<string, T[]> {
  const out = new Map<string, T[]>();
  for (const row of rows) {
    const k = key(row);
    const list = out.get(k);
    if (list) list.push(row);
    else out.set(k, [row]);
  }
  return out;
}

/** The latest record dated on or before the cut-off (the greater km on a same-day tie). */
export function lastDoneBy(records: readonly BacktestServiceRecord[], cutoff: IsoDate): KmReading | null {
  let last: BacktestServiceRecord | null = null;
  for (const r of records) {
    if (compareIso(r.date, cutoff) > 0) continue;
    if (!last || compareIso(r.date, last.date) > 0 || (r.date === last.date && r.odometerKm > last.odometerKm)) last = r;
  }
  return last ? { date: last.date, odometerKm: last.odometerKm } : null;
}

/** Where an item next fell due as of the cut-off: the last service (else going into service) plus its km and months. */
export function dueAsOf(
  item: BacktestServiceItem,
  lastDone: KmReading | null,
  inService: KmReading,
): Pick<ForecastItemInput, 'nextDueKm' | 'nextDueDate'> {
  const baseline = lastDone ?? inService;
  return {
    nextDueKm: dueAtKmFor({ everyKm: item.everyKm, firstAtKm: item.firstAtKm ?? null }, lastDone, inService),
    nextDueDate: item.everyMonths ? addMonthsIso(baseline.date, item.everyMonths) : null,
  };
}

/** The bike's odometer as of the cut-off: its greatest reading on or before it, never below going into service. */
export function kmAsOf(readings: readonly KmReading[], inService: KmReading, cutoff: IsoDate): number {
  let km = inService.odometerKm;
  for (const r of readings) if (compareIso(r.date, cutoff) <= 0 && r.odometerKm > km) km = r.odometerKm;
  return km;
}

/** The bike's daily distances from its check-ins of the `windowDays` days up to the cut-off, as the forecast reads them. */
export function distancesAsOf(readings: readonly KmReading[], cutoff: IsoDate, windowDays: number): number[] {
  const since = addDaysIso(cutoff, -windowDays);
  const recent = readings.filter((r) => compareIso(r.date, since) >= 0 && compareIso(r.date, cutoff) <= 0);
  return dailyDistances(recent, windowDays);
}

/** A bike's odometer on the three days a year back that the seasonal factor reads. */
export function yearAgoKmAsOf(readings: readonly KmReading[], cutoff: IsoDate, windowDays: number, horizonDays: number): YearAgoKm {
  const d = yearAgoDays(cutoff, windowDays, horizonDays);
  // As the server reads it: the greatest reading by each day, from a month before the window on.
  const from = addDaysIso(d.windowStart, -30);
  const by = (day: IsoDate) => {
    let km: number | null = null;
    for (const r of readings) if (compareIso(r.date, from) >= 0 && compareIso(r.date, day) <= 0 && (km === null || r.odometerKm > km)) km = r.odometerKm;
    return km;
  };
  return { atWindowStart: by(d.windowStart), atYearAgo: by(d.yearAgo), atHorizonEnd: by(d.horizonEnd) };
}

/** The forecast inputs as they stood at the end of the cut-off day: bikes in service by then, items with parts, riding scaled by the season. */
export function forecastInputsAsOf(h: BacktestHistory, cutoff: IsoDate, windowDays: number, horizonDays = DEFAULT_BACKTEST_HORIZON_DAYS): ForecastBikeInput[] {
  const partsOf = groupBy(h.itemParts, (p) => p.serviceItemId);
  const itemsOf = groupBy(h.serviceItems.filter((i) => partsOf.has(i.id)), (i) => i.modelId);
  const readingsOf = groupBy(h.readings, (r) => r.bikeId);
  const recordsOf = groupBy(h.serviceRecords, (r) => `${r.bikeId}|${r.serviceItemId}`);
  const season = new Map<string, number>();
  for (const [siteId, bikes] of groupBy(h.bikes, (b) => b.siteId))
    season.set(siteId, seasonalFactor(bikes.map((b) => yearAgoKmAsOf(readingsOf.get(b.id) ?? [], cutoff, windowDays, horizonDays)), windowDays, horizonDays));
  const out: ForecastBikeInput[] = [];
  for (const bike of h.bikes) {
    if (compareIso(bike.inService.date, cutoff) > 0) continue;
    const readings = readingsOf.get(bike.id) ?? [];
    const items = (itemsOf.get(bike.modelId) ?? []).map((item): ForecastItemInput => ({
      serviceItemId: item.id,
      everyKm: item.everyKm,
      everyMonths: item.everyMonths,
      ...dueAsOf(item, lastDoneBy(recordsOf.get(`${bike.id}|${item.id}`) ?? [], cutoff), bike.inService),
      plannedDate: null,
      parts: (partsOf.get(item.id) ?? []).map(({ partId, quantity, share }) => ({ partId, quantity, share })),
    }));
    if (!items.length) continue;
    out.push({
      bikeId: bike.id, siteId: bike.siteId, currentKm: kmAsOf(readings, bike.inService, cutoff),
      dailyKm: distancesAsOf(readings, cutoff, windowDays).map((km) => km * season.get(bike.siteId)!), items,
    });
  }
  return out.sort((a, b) => (a.bikeId < b.bikeId ? -1 : a.bikeId > b.bikeId ? 1 : 0));
}

/** Whole weeks the forecast must run, from the Monday of `start`, to cover `days` days from `start`. */
export function weeksToCover(start: IsoDate, days: number): number {
  return Math.ceil((daysBetween(weekStartOf(start), start) + days) / 7);
}

/** Each part's P50 over the runs of its total in the first `days` days, every site together. */
export function partP50s(s: ForecastSamples, days: number): Map<string, number> {
  const perRun = new Map<string, Float64Array>();
  for (const line of s.lines) {
    const totals = runTotals(s, line, days);
    const sum = perRun.get(line.partId) ?? new Float64Array(s.runs);
    for (let r = 0; r < s.runs; r++) sum[r] += totals[r];
    perRun.set(line.partId, sum);
  }
  return new Map([...perRun].map(([partId, totals]) => [partId, quantileSorted(Float64Array.from(totals).sort(), 0.5)]));
}

/** Expected use per part of the services done after the cut-off up to today: Σ quantity × share. */
export function actualUse(h: BacktestHistory, cutoff: IsoDate): Map<string, number> {
  const partsOf = groupBy(h.itemParts, (p) => p.serviceItemId);
  const out = new Map<string, number>();
  for (const r of h.serviceRecords) {
    if (compareIso(r.date, cutoff) <= 0 || compareIso(r.date, h.today) > 0) continue;
    for (const p of partsOf.get(r.serviceItemId) ?? []) out.set(p.partId, (out.get(p.partId) ?? 0) + p.quantity * p.share);
  }
  return out;
}

/** |forecast − actual| / actual, or null when the actual is zero. */
export function absPctError(forecast: number, actual: number): number | null {
  return actual === 0 ? null : Math.abs(forecast - actual) / actual;
}

/** Per-part figures summed into their families, in the families' order of first appearance in the catalogue. */
export function byFamily(parts: readonly BacktestPart[], forecast: Map<string, number>, actual: Map<string, number>): FamilyBacktest[] {
  const sums = new Map<string, { forecastP50: number; actual: number }>();
  for (const p of parts) {
    const f = sums.get(p.family) ?? { forecastP50: 0, actual: 0 };
    f.forecastP50 += forecast.get(p.id) ?? 0;
    f.actual += actual.get(p.id) ?? 0;
    sums.set(p.family, f);
  }
  return [...sums].map(([family, f]) => ({ family, ...f, absPctError: absPctError(f.forecastP50, f.actual) }));
}

/** The mean of the errors that exist; null when there are none. */
export function meanAbsPctError(families: readonly FamilyBacktest[]): number | null {
  const errors = families.flatMap((f) => (f.absPctError === null ? [] : [f.absPctError]));
  return errors.length ? errors.reduce((a, b) => a + b, 0) / errors.length : null;
}

/** The forecast made at today − horizon, against what the service records say was used since. */
export function backtestPartsForecast(h: BacktestHistory, o: BacktestOptions = {}): BacktestResult {
  const horizonDays = o.horizonDays ?? DEFAULT_BACKTEST_HORIZON_DAYS;
  const windowDays = o.windowDays ?? DEFAULT_BACKTEST_WINDOW_DAYS;
  const cutoff = addDaysIso(h.today, -horizonDays);
  // The forecast's first day is the day after the cut-off, its last today.
  const start = addDaysIso(cutoff, 1);
  const sim = simulatePartUse(forecastInputsAsOf(h, cutoff, windowDays, horizonDays), {
    today: start, weeks: weeksToCover(start, horizonDays), runs: o.runs ?? DEFAULT_BACKTEST_RUNS, seed: o.seed ?? 'backtest',
  });
  const families = byFamily(h.parts, partP50s(sim, horizonDays), actualUse(h, cutoff));
  return { cutoff, today: h.today, horizonDays, windowDays, families, mape: meanAbsPctError(families) };
}
