import type { Results } from './run';
import { kb, mb, ms, ratio, type Row } from './report';

const n = (x: number) => x.toLocaleString('en-GB');
/** The first table a statement reads, to name it in a cell. */
export const tableOf = (sql: string) => /\bfrom\s+"?([a-z_]+)"?/i.exec(sql)?.[1] ?? 'first';
const exponent = (t1: number, t2: number, n1: number, n2: number) => Math.log(t2 / t1) / Math.log(n2 / n1);

/** The table: every figure beside its target and the floor measured in the same run on the same data. */
export function figureRows(r: Results): Row[] {
  const rows: Row[] = [];
  const main = r.scans.find((s) => s.bikes === r.args.bikes);
  for (const s of r.scans) {
    const target = s.bikes === 2000 ? '≤ 2 s, ratio ≤ 3' : 'ratio ≤ 3';
    const ok = (t: number) => (s.bikes === 2000 ? t <= 2000 : true) && t / s.floorMs <= 3;
    const floor = `${ms(s.floorMs)} (${n(s.floorRows)} rows)`;
    rows.push({ figure: `a. Due scan, ${n(s.bikes)} bikes, first run (${n(s.first.tasksRaised)} tasks raised)`, measured: ms(s.first.ms), target, floor, ratio: ratio(s.first.ms, s.floorMs), ok: ok(s.first.ms) });
    rows.push({ figure: `a. Due scan, ${n(s.bikes)} bikes, repeat (median of 2)`, measured: ms(s.repeatMs), target, floor, ratio: ratio(s.repeatMs, s.floorMs), ok: ok(s.repeatMs) });
    rows.push({
      figure: `a. Due scan, ${n(s.bikes)} bikes, repeat, against the lean floor`,
      measured: ms(s.repeatMs),
      target: 'ratio ≤ 3',
      floor: `${ms(s.leanFloorMs)} (${n(s.leanFloorRows)} rows: only the readings the computation uses)`,
      ratio: ratio(s.repeatMs, s.leanFloorMs),
      ok: s.repeatMs / s.leanFloorMs <= 3,
    });
  }
  const sorted = [...r.scans].sort((x, y) => x.bikes - y.bikes);
  for (let i = 1; i < sorted.length; i++) {
    const [a, b] = [sorted[i - 1], sorted[i]];
    const e = exponent(a.repeatMs, b.repeatMs, a.bikes, b.bikes);
    const f = exponent(a.floorMs, b.floorMs, a.bikes, b.bikes);
    rows.push({ figure: `a. Scaling exponent of the scan, ${n(a.bikes)} → ${n(b.bikes)} bikes`, measured: e.toFixed(2), target: '≤ 1', floor: `${f.toFixed(2)} (floor's own)`, ratio: '—', ok: e <= 1 });
  }
  if (r.api) {
    const { direct, dueLoad: d, checkIns: c } = r.api;
    const dueFloor = `${ms(direct.p99)} p99 of ${direct.runs} direct runs (p50 ${ms(direct.p50)}, ${n(direct.items)} items)`;
    rows.push({ figure: 'b. Due list API p50, 20 connections', measured: ms(d.p50), target: '—', floor: `${ms(direct.p50)} (direct p50)`, ratio: ratio(d.p50, direct.p50), ok: null });
    rows.push({ figure: 'b. Due list API p97.5', measured: ms(d.p97_5), target: '—', floor: '—', ratio: '—', ok: null });
    rows.push({ figure: 'b. Due list API p99', measured: ms(d.p99), target: '≤ 100 ms', floor: dueFloor, ratio: ratio(d.p99, direct.p99), ok: d.p99 <= 100 && d.non2xx === 0 });
    rows.push({
      figure: 'b. Due list API requests/s',
      measured: `${d.perSecond.toFixed(1)}/s (${n(d.requests)} in ${d.seconds} s${d.non2xx ? `, ${n(d.non2xx)} not 2xx` : ''}${d.errors ? `, ${d.errors} errors` : ''})`,
      target: '—',
      floor: `${(1000 / direct.p50).toFixed(1)}/s (one at a time, direct)`,
      ratio: ratio(1000 / direct.p50, d.perSecond),
      ok: null,
    });
    rows.push({ figure: 'b. Server event-loop delay during that load (p99 / max)', measured: `${ms(d.loopDelayP99)} / ${ms(d.loopDelayMax)}`, target: '—', floor: '—', ratio: '—', ok: null });
    const created = c.main.status['201'] ?? 0;
    const others = Object.entries(c.main.status).filter(([k]) => k !== '201').map(([k, v]) => `${n(v)}×${k}`).join(', ');
    rows.push({
      figure: 'c. Check-ins per second through the API, 20 connections',
      measured: `${c.main.perSecond.toFixed(1)}/s (${n(c.main.requests)} in ${c.main.seconds.toFixed(2)} s to the last answer; p99 ${ms(c.main.p99)})`,
      target: '≥ 200/s',
      floor: `${c.floorPerSecond.toFixed(0)}/s (one row per transaction, direct)`,
      ratio: `${(c.floorPerSecond / c.main.perSecond).toFixed(1)}× slower`,
      ok: c.main.perSecond >= 200,
    });
    const lost = created - c.found;
    rows.push({
      figure: 'c. Lost check-ins (201 answers without their row)',
      measured: `${n(lost)} (${n(created)} answered 201, ${n(c.rowsAdded)} rows added, ${n(c.found)} ids found${others ? `; also ${others}` : ''})`,
      target: '0, and rows added = 201s',
      floor: '—',
      ratio: '—',
      ok: lost === 0 && c.rowsAdded === created,
    });
  }
  if (r.plan) {
    const p = r.plan;
    const load = `${n(p.tasks)} tasks, ${n(p.bays)} bays, ${n(p.technicians)} technicians, ${n(p.bookings)} bookings`;
    const terms = (o: typeof p.terms) => `${o.safetyLateDays} safety-late days, ${o.lateDays} late days, ${o.bookedHoursLost.toFixed(1)} booked h lost, ${n(o.visits)} visits, spread ${Math.round(o.loadSpread)} min`;
    rows.push({
      figure: `f. Full workshop plan, ${n(p.bikes)} bikes, two weeks (${load}; ${n(p.full.visits)} visits, ${n(p.full.unplaced)} not placed)`,
      measured: `${ms(p.full.ms)} (CPU ${ms(p.full.cpuMs)}; planner alone ${ms(p.pureMs)})`,
      target: '≤ 5 s',
      floor: `${ms(p.greedyMs)} (earliest-due-date greedy alone)`,
      ratio: ratio(p.full.ms, p.greedyMs),
      ok: p.full.ms <= 5000,
    });
    rows.push({ figure: 'f. Full workshop plan again (every visit kept)', measured: ms(p.repeatMs), target: '≤ 5 s', floor: '—', ratio: '—', ok: p.repeatMs <= 5000 });
    rows.push({ figure: 'f. Re-plan after one check-in (one bike, around every other visit)', measured: ms(p.replanOneMs), target: '≤ 300 ms', floor: '—', ratio: '—', ok: p.replanOneMs <= 300 });
    rows.push({
      figure: `f. Plan objective against the earliest-due-date greedy (${terms(p.terms)})`,
      measured: n(Math.round(p.objective)),
      target: '≤ greedy',
      floor: `${n(Math.round(p.greedyObjective))} (${terms(p.greedyTerms)})`,
      ratio: ratio(p.objective, p.greedyObjective),
      ok: p.objective <= p.greedyObjective,
    });
    rows.push({
      figure: 'f. Plan objective against the LP relaxation bound (HiGHS, day-level model)',
      measured: n(Math.round(p.objective)),
      target: 'report',
      floor: p.lpBound === null ? `none (${p.lpStatus})` : `${n(Math.round(p.lpBound))} (${p.lpStatus})`,
      ratio: p.lpBound ? ratio(p.objective, p.lpBound) : '—',
      ok: null,
    });
  }
  if (r.parts) {
    const { seeded, sites } = r.parts;
    const what = `${seeded.parts} parts, 8 weeks, ${sites[0]?.cold.runs ?? 0} runs`;
    for (const s of sites) {
      const sp = s.split;
      const slowest = [...sp.statements].sort((a, b) => b.ms - a.ms)[0];
      const gaps = [...sp.statements].sort((a, b) => b.jsBeforeMs - a.jsBeforeMs).slice(0, 2).map((g) => `${ms(g.jsBeforeMs)} before the ${tableOf(g.sql)} query`);
      rows.push({ figure: `g. Parts forecast, ${s.site} (${n(s.bikes)} bikes, ${what}), cold`, measured: `${ms(s.cold.ms)} (CPU ${ms(s.cold.cpuMs)})`, target: '≤ 1 s', floor: '—', ratio: '—', ok: s.cold.ms <= 1000 });
      rows.push({
        figure: `g. Parts forecast, ${s.site}, warm (median of ${s.warmRuns}; ${n(s.cold.runningOut)} parts run out within 8 weeks)`,
        measured: `${ms(s.warmMs)} (CPU ${ms(s.warmCpuMs)})`,
        target: '≤ 1 s',
        floor: `${ms(sp.sqlMs)} (the SQL of one warm run of ${ms(sp.wallMs)}: ${sp.statements.length} statements, slowest ${ms(slowest?.ms)} on ${tableOf(slowest?.sql ?? '')}, ${n(slowest?.rows ?? 0)} rows)`,
        ratio: ratio(sp.wallMs, sp.sqlMs),
        ok: s.warmMs <= 1000,
      });
      rows.push({ figure: `g. Parts forecast, ${s.site}: the JS of that warm run (between and after its statements)`, measured: `${ms(sp.wallMs - sp.sqlMs)}: ${gaps.join(', ')}, ${ms(sp.tailMs)} after the last`, target: '—', floor: '—', ratio: '—', ok: null });
    }
    const sum = (f: (s: (typeof sites)[number]) => number) => sites.reduce((t, s) => t + f(s), 0);
    rows.push({ figure: `g. Parts forecast, all ${sites.length} sites together (${n(sum((s) => s.bikes))} bikes), warm medians summed`, measured: `${ms(sum((s) => s.warmMs))} (cold ${ms(sum((s) => s.cold.ms))})`, target: '—', floor: '—', ratio: '—', ok: null });
    for (const s of sites) {
      rows.push({ figure: `g. Stock page API, GET /api/stock?site= (${s.site}, ${seeded.parts} parts; median of ${s.httpRuns})`, measured: ms(s.stockHttpMs), target: '≤ 1 s', floor: `${ms(s.stockDirectMs)} (stockView direct, median of ${s.httpRuns})`, ratio: ratio(s.stockHttpMs, s.stockDirectMs), ok: s.stockHttpMs <= 1000 });
      rows.push({ figure: `g. Forecast API, GET /api/forecast?site=&weeks=8 (${s.site}; median of ${s.warmRuns}; repeats answered from the kept simulation, shelf read fresh)`, measured: ms(s.forecastHttpMs), target: '≤ 1 s', floor: `${ms(s.warmMs)} (forecastFor direct, warm median)`, ratio: ratio(s.forecastHttpMs, s.warmMs), ok: s.forecastHttpMs <= 1000 });
    }
  }
  if (r.bundle) {
    const b = r.bundle;
    rows.push({ figure: `d. First-load JS, gzip (${b.files.length} files: entry + modulepreload)`, measured: `${kb(b.jsGzip)} (${kb(b.jsBytes)} raw; CSS ${kb(b.cssGzip)} gzip)`, target: '≤ 200 KB', floor: '—', ratio: '—', ok: b.jsGzip <= 200 * 1024 });
    rows.push({ figure: `d. Precached for offline by the service worker after the first load (${b.precache.files} files: every screen's chunk, fonts, icons)`, measured: `${kb(b.precache.gzip)} gzip (${kb(b.precache.bytes)} raw)`, target: '—', floor: '—', ratio: '—', ok: null });
  }
  if (r.offlineCard) {
    const o = r.offlineCard;
    const sorted = [...o.runsMs].sort((a, b) => a - b);
    rows.push({
      figure: `d. Valve card opened offline, tablet viewport ${o.viewport} (reload without network → first valve; median of ${o.runsMs.length}, ${o.valves} valves)`,
      measured: `${ms(sorted[Math.floor(sorted.length / 2)])} (slowest ${ms(sorted.at(-1))})`,
      target: '≤ 500 ms', floor: '—', ratio: '—', ok: sorted[Math.floor(sorted.length / 2)] <= 500,
    });
  }
  for (const s of r.screens ?? []) {
    const what = s.route === '/plan' ? 'visit blocks' : 'rows';
    rows.push({ figure: `d. ${s.route}: navigation → first ${what} visible (${n(s.rows)} ${what} on screen)`, measured: ms(s.firstRowMs), target: '≤ 1 s', floor: `${ms(s.apiMs)} (${s.apiPath} answered)`, ratio: ratio(s.firstRowMs, s.apiMs), ok: s.firstRowMs !== null && s.firstRowMs <= 1000 });
    if (s.route !== '/plan') rows.push({ figure: `d. ${s.route}: sort a column (slowest of 3 clicks)`, measured: `${ms(s.sortDomMs)} DOM, ${ms(s.sortPaintMs)} to next frame${s.sortChanged ? '' : ' (order did not change!)'}`, target: '≤ 100 ms', floor: '—', ratio: '—', ok: s.sortDomMs !== null && s.sortDomMs <= 100 && s.sortChanged });
    rows.push({ figure: `d. ${s.route}: LCP`, measured: ms(s.lcpMs), target: '≤ 2.5 s', floor: '—', ratio: '—', ok: s.lcpMs !== null && s.lcpMs <= 2500 });
    rows.push({ figure: `d. ${s.route}: CLS`, measured: s.cls.toFixed(3), target: '≤ 0.1', floor: '—', ratio: '—', ok: s.cls <= 0.1 });
  }
  if (r.memory) {
    const { start, end, afterGc } = r.memory;
    rows.push({ figure: `e. Server RSS after the runs (${n(main?.bikes ?? r.args.bikes)} bikes; peak ${mb(end.maxRss)})`, measured: mb(end.rss), target: '≤ 400 MB', floor: `${mb(start.rss)} (just started, database open)`, ratio: ratio(end.rss, start.rss), ok: end.rss <= 400 * 1_048_576 });
    rows.push({
      figure: 'e. Server memory after a full garbage collection (JS heap in use; PGlite and buffers)',
      measured: `RSS ${mb(afterGc.rss)}: heap ${mb(afterGc.heapUsed)}, external ${mb(afterGc.external)}`,
      target: '—',
      floor: '—',
      ratio: '—',
      ok: null,
    });
  }
  return rows;
}
