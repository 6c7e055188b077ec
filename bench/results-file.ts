import type { Results } from './run';
import { probeMarkdown, short } from './evidence';
import { figuresTable, kb, markdownTable, ms, phasesTable, type Row } from './report';

const n = (x: number) => x.toLocaleString('en-GB');

/** bench/RESULTS.md: the table, the phases, the machine and the command, then where the time went. */
export function resultsMarkdown(r: Results, rows: Row[], m: { cpu: string; free: string; nproc: string; node: string }) {
  const a = r.args;
  const cmd = `npm run bench${process.argv.length > 2 ? ` -- ${process.argv.slice(2).join(' ')}` : ''}`;
  const engine = a.databaseUrl ? 'PostgreSQL (DATABASE_URL)' : 'on-disk PGlite under bench/.data/';
  const gen = r.generated.map((g) => [n(g.bikes), n(g.totalRows), n(g.rows.odometerReadings ?? 0), n(g.rows.serviceRecords ?? 0), n(g.rows.valveReadings ?? 0), g.seconds.total.toFixed(1)]);
  const parts = r.scans.map((s) => [n(s.bikes), ms(s.parts.loadMs), ms(s.parts.computeMs), ms(s.parts.applyMs), ms(s.parts.warningsMs), n(s.parts.readingsLoaded), `${ms(s.repeatCpuMs)} of ${ms(s.repeatMs)}`]);
  const files = (r.bundle?.files ?? []).map((f) => [f.file, kb(f.bytes), kb(f.gzip)]);
  const screens = (r.screens ?? []).map((x) =>
    `- \`${x.route}\`: first rows at ${ms(x.firstRowMs)}, ${x.apiPath} answered at ${ms(x.apiMs)}, ${kb(x.scriptBytes)} of JS fetched as served ` +
    `(gzip, as the server sends it, this screen's chunks included); shifts ≥ 0.01: ${x.shifts.length ? x.shifts.map((h) => `${h.value.toFixed(3)} at ${ms(h.at)} (${h.moved.join('; ')})`).join(', ') : 'none'}.\n` +
    `  Waterfall (from navigation start): ${x.waterfall.map((e) => `${e.path.replace(/^\/assets\//, '')} ${Math.round(e.start)}→${Math.round(e.end)} ms`).join(', ')}`,
  );
  const probes = [...r.scans.map((s) => s.probe), ...(r.api?.probes ?? []), ...(r.parts?.probes ?? [])];
  const cpu = [...(r.api?.cpu ?? []), ...(r.parts ? [r.parts.cpu] : [])];
  const seeded = r.parts?.seeded;
  const forecastParts = (r.parts?.sites ?? []).map(({ site, bikes, split: sp }) =>
    `#### ${site} (${n(bikes)} bikes): ${ms(sp.wallMs)} wall, ${ms(sp.sqlMs)} in ${sp.statements.length} statements\n\n` +
    markdownTable(['JS before', 'Statement', 'Rows', 'SQL'], [
      ...sp.statements.map((x) => [ms(x.jsBeforeMs), ms(x.ms), n(x.rows), `\`${short(x.sql).replace(/\|/g, '\\|')}\``]),
      [ms(sp.tailMs), '—', '—', 'after the last statement: weekly quantiles, run-out days, suggested orders'],
    ]));
  return `# Benchmark results

Written by \`bench/run.ts\` on every run; the last run wins.

- Command: \`${cmd}\`
- Run at: ${new Date().toISOString()}; data dated to ${a.today}, seed \`${a.seed}\`; database: ${engine}
- Machine: ${m.nproc} CPUs (\`nproc\`), ${m.cpu}; Node ${m.node}
- Load average (1, 5, 15 min) before the run: ${r.loadBefore}; after: ${r.loadAfter ?? 'n/a'}. Other work on the machine slows every figure; compare runs at a similar load.

\`\`\`
$ free -h
${m.free}
\`\`\`

## Figures

${figuresTable(rows)}

Floors: the due scan's is one SQL statement reading the same rows (latest and first reading per bike, the
readings in the 90-day window, the last service of each item) with no computation and no writes; the due
list's is \`listDue\` called straight on the database, one call at a time; the check-in floor is one odometer
row inserted per transaction straight on the database; a screen's is the moment its API call answered.

## Phases

${phasesTable(r.phases)}

## Generated data

${markdownTable(['Bikes', 'Rows', 'Odometer readings', 'Service records', 'Valve readings', 'Seconds'], gen)}

## Client

${markdownTable(['First-load file', 'Raw', 'gzip'], files)}

${screens.join('\n')}

## Due scan in parts (loadDueInputs, computeAll, applyDue, valve warnings)

${markdownTable(['Bikes', 'Load inputs', 'Compute', 'Apply', 'Valve warnings', 'Readings loaded', 'Scan CPU of wall'], parts)}

## Parts forecast in parts (one warm run per site: each statement, and the JS run before it)

${seeded ? `The bench shelf (${seeded.inserted ? 'added in this run' : 'there already'}): ${n(seeded.parts)} parts from ${n(seeded.suppliers)} suppliers, ${n(seeded.links)} service-item links, ${n(seeded.stockRows)} shelf rows.
The JS before a statement ran after the one before had answered: the rows mapped, the inputs built, and before the
\`parts\` query, the simulation.

${forecastParts.join('\n\n')}` : 'Not measured in this run.'}

## Where the server's CPU goes under load (V8 sampling profiler, self time)

${cpu.map((c) => `#### ${c.label} (${Math.round(c.sampledMs)} ms sampled)\n\n` +
  markdownTable(['Part', 'Share'], c.byPart.map((p) => [p.what, `${(100 * p.share).toFixed(1)} %`])) + '\n\n' +
  markdownTable(['Function (self time)', 'Share'], c.topFunctions.slice(0, 8).map((p) => [p.what, `${(100 * p.share).toFixed(1)} %`]))).join('\n\n')}

## Where the time goes: statements per piece of work

${probes.map((p) => probeMarkdown(p)).join('\n\n')}
`;
}
