import { describe, expect, it } from 'vitest';
import { addDays, addMonths, differenceInCalendarDays, format, parseISO } from 'date-fns';
import { mean, sum } from 'simple-statistics';
import { buildScenario, type Scenario } from '../../server/demo/scenario';
import { buildParts, type DemoParts } from '../../server/demo/parts-demo';
import { backtestPartsForecast, type BacktestHistory, type BacktestResult } from '../../shared/domain/parts-backtest';
import { toKm } from '../../shared/domain/units';

const TODAY = '2026-12-04';
const iso = (d: Date) => format(d, 'yyyy-MM-dd');

/** The demo's rows as the backtest reads them: ids, dates and continuous km only. */
function historyOf(s: Scenario, p: DemoParts): BacktestHistory {
  return {
    today: s.today,
    bikes: s.bikes.map((b) => ({ id: b.id, siteId: b.siteId, modelId: b.modelId, inService: { date: b.inServiceDate, odometerKm: toKm(b.inServiceOdometer, b.odometerUnit) } })),
    readings: s.odometerReadings.map((r) => ({ bikeId: r.bikeId, date: r.date, odometerKm: r.odometerKm })),
    serviceRecords: s.serviceRecords.map((r) => ({ bikeId: r.bikeId, serviceItemId: r.serviceItemId, date: r.date, odometerKm: r.odometerKm })),
    serviceItems: s.serviceItems.map((i) => ({ id: i.id, modelId: i.modelId, everyKm: i.everyKm, everyMonths: i.everyMonths, firstAtKm: i.firstAtKm })),
    itemParts: p.serviceItemParts.map((u) => ({ serviceItemId: u.serviceItemId, partId: u.partId, quantity: u.quantity, share: u.share ?? 1 })),
    parts: p.parts.map((x) => ({ id: x.id!, family: x.family })),
  };
}

const pct = (v: number | null) => (v === null ? '—' : `${(100 * v).toFixed(1)} %`);

function table(r: BacktestResult): string {
  const rows = r.families.map((f) => `${f.family.padEnd(8)} ${f.forecastP50.toFixed(2).padStart(12)} ${f.actual.toFixed(2).padStart(10)} ${pct(f.absPctError).padStart(10)}`);
  return [
    `Parts forecast backtest: cut-off ${r.cutoff}, ${r.horizonDays} days to ${r.today}, riding from the ${r.windowDays} days before the cut-off`,
    `${'family'.padEnd(8)} ${'forecast P50'.padStart(12)} ${'actual'.padStart(10)} ${'abs % err'.padStart(10)}`,
    ...rows,
    `MAPE ${pct(r.mape)}`,
  ].join('\n');
}

describe('the parts forecast against the demo fleet’s own history', () => {
  const s = buildScenario(TODAY);
  const p = buildParts(s);
  const h = historyOf(s, p);
  const r = backtestPartsForecast(h);
  console.log(table(r));
  // The same cut-off with a shorter and a longer riding window: the error hardly moves with the window.
  for (const windowDays of [28, 90]) console.log(`riding window ${windowDays} days: MAPE ${pct(backtestPartsForecast(h, { windowDays }).mape)}`);

  it('stands 90 days back and covers every family the demo’s services use', () => {
    // date-fns addDays: the cut-off is today less 90 calendar days.
    expect(r.cutoff).toBe(iso(addDays(parseISO(TODAY), -90)));
    expect(r.families.map((f) => f.family).sort()).toEqual([...new Set(p.parts.map((x) => x.family))].sort());
  });

  it('gives every family a finite forecast of zero or more', () => {
    for (const f of r.families) {
      expect(Number.isFinite(f.forecastP50)).toBe(true);
      expect(f.forecastP50).toBeGreaterThanOrEqual(0);
    }
  });

  it('counts as used what the window’s service records take, quantity × share (simple-statistics sum)', () => {
    // Recounted straight from the demo rows: every record dated after the cut-off up to today,
    // each part of its item at quantity × share, added with simple-statistics `sum`.
    const familyOf = new Map(p.parts.map((x) => [x.id!, x.family]));
    const inWindow = s.serviceRecords.filter((rec) => rec.date > r.cutoff && rec.date <= TODAY);
    for (const f of r.families) {
      const uses = inWindow.flatMap((rec) => p.serviceItemParts.filter((u) => u.serviceItemId === rec.serviceItemId && familyOf.get(u.partId) === f.family).map((u) => u.quantity * (u.share ?? 1)));
      expect(f.actual).toBeCloseTo(uses.length ? sum(uses) : 0, 9);
    }
  });

  it('forecasts the oil within 20 % of what was used', () => {
    // Measured: about 6 % under. Without the seasonal factor it was 47 % over (the riding of July and
    // August carried into autumn, when the demo fleet rides about 0.58 times as far a day). The
    // bound leaves room for noise and fails if the season is lost again.
    const oil = r.families.find((f) => f.family === 'oil')!;
    expect(oil.actual).toBeGreaterThan(0);
    // Absolute percentage error |F − A| / A (Hyndman & Koehler 2006, "Another look at measures of forecast accuracy").
    expect(oil.absPctError).toBeCloseTo(Math.abs(oil.forecastP50 - oil.actual) / oil.actual, 12);
    expect(oil.absPctError!).toBeLessThanOrEqual(0.2);
  });

  it('keeps the MAPE over families under 20 %, the mean of the families’ errors (simple-statistics mean)', () => {
    const errors = r.families.filter((f) => f.actual > 0).map((f) => Math.abs(f.forecastP50 - f.actual) / f.actual);
    expect(errors.length).toBeGreaterThan(3);
    // simple-statistics mean of the per-family absolute percentage errors.
    expect(r.mape!).toBeCloseTo(mean(errors), 12);
    // Measured 13 % with the seasonal factor (26–29 % under eight seeds without it).
    expect(r.mape!).toBeLessThan(0.2);
  });
});

describe('a hand-made fleet of two bikes and one item', () => {
  // Item: every 1,000 km or every month, one service takes 1.5 units of part "p" (share 1).
  // Cut-off D = 2026-09-05 (90 days before 2026-12-04); the forecast runs 2026-09-06 … 2026-12-04.
  //
  // Bike A rides 50 km every day (a check-in each day from D − 60) and was serviced on D itself at
  // 13,000 km (that service is history, not part of the window): due again every 1,000 km = 20 days,
  // sooner than a month each time: 09-25, 10-15, 11-04, 11-24, and 12-14 is past today. 4 services.
  // Bike B stands still (5,000 km at D − 60 and at D), last serviced 2026-09-04: the calendar brings
  // it round on 10-04, 11-04 and 12-04, today itself, the window's last day. 3 services.
  // Forecast: (4 + 3) × 1.5 = 10.5 in every run, so its P50 is 10.5.
  // Done: A on 09-24, 10-14, 11-03, 11-23 and B on 10-03 and 12-04 (today counts): six services × 1.5
  // = 9; A's service on 12-05 falls after today. |10.5 − 9| / 9 = 1/6.
  const D = '2026-09-05';
  const item = { id: 'i', modelId: 'm', everyKm: 1000, everyMonths: 1, firstAtKm: null };
  const daysBack = Array.from({ length: 61 }, (_, k) => iso(addDays(parseISO(D), k - 60)));
  const h: BacktestHistory = {
    today: TODAY,
    bikes: [
      { id: 'a', siteId: 's', modelId: 'm', inService: { date: '2025-01-01', odometerKm: 0 } },
      { id: 'b', siteId: 's', modelId: 'm', inService: { date: '2025-01-01', odometerKm: 0 } },
    ],
    readings: [
      ...daysBack.map((date, k) => ({ bikeId: 'a', date, odometerKm: 10_000 + 50 * k })),
      { bikeId: 'b', date: daysBack[0], odometerKm: 5000 },
      { bikeId: 'b', date: D, odometerKm: 5000 },
    ],
    serviceRecords: [
      { bikeId: 'a', serviceItemId: 'i', date: D, odometerKm: 13_000 },
      { bikeId: 'b', serviceItemId: 'i', date: '2026-09-04', odometerKm: 4990 },
      ...['2026-09-24', '2026-10-14', '2026-11-03', '2026-11-23', '2026-12-05'].map((date) => ({ bikeId: 'a', serviceItemId: 'i', date, odometerKm: 0 })),
      ...['2026-10-03', TODAY].map((date) => ({ bikeId: 'b', serviceItemId: 'i', date, odometerKm: 0 })),
    ],
    serviceItems: [item],
    itemParts: [{ serviceItemId: 'i', partId: 'p', quantity: 1.5, share: 1 }],
    parts: [{ id: 'p', family: 'oil' }, { id: 'q', family: 'plug' }],
  };

  it('forecasts the services worked out by hand, and their error', () => {
    const r = backtestPartsForecast(h, { runs: 20 });
    expect(r.cutoff).toBe(D);
    // Bike A: km due every 1,000 km / 50 km a day = 20 days after D, while within the window.
    const start = parseISO('2026-09-06');
    const window = differenceInCalendarDays(parseISO(TODAY), parseISO(D));
    const bikeA = [20, 40, 60, 80, 100].filter((d) => d <= window).length;
    // Bike B: date-fns addMonths from the last service, month after month, up to today.
    const bikeB = [1, 2, 3, 4].map((n) => addMonths(parseISO('2026-09-04'), n)).filter((d) => d >= start && d <= parseISO(TODAY)).length;
    expect([bikeA, bikeB]).toEqual([4, 3]);
    const oil = r.families.find((f) => f.family === 'oil')!;
    expect(oil.forecastP50).toBe((bikeA + bikeB) * 1.5);
    expect(oil.actual).toBe(6 * 1.5);
    expect(oil.absPctError).toBeCloseTo(1 / 6, 12);
    // A family nothing used has no error, and the MAPE is the one family's.
    expect(r.families.find((f) => f.family === 'plug')).toEqual({ family: 'plug', forecastP50: 0, actual: 0, absPctError: null });
    expect(r.mape).toBeCloseTo(1 / 6, 12);
  });
});
