import { spawnSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { availableParallelism, loadavg } from 'node:os';

export interface Row {
  figure: string;
  measured: string;
  target: string;
  floor: string;
  ratio: string;
  /** null: no target to meet. */
  ok: boolean | null;
}

export interface Phase {
  phase: string;
  seconds: number;
}

const verdict = (ok: boolean | null) => (ok === null ? '' : ok ? 'met' : 'MISSED');

export function markdownTable(head: string[], rows: string[][]) {
  const widths = head.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
  const line = (cells: string[]) => `| ${cells.map((c, i) => c.padEnd(widths[i])).join(' | ')} |`;
  return [line(head), `| ${widths.map((w) => '-'.repeat(w)).join(' | ')} |`, ...rows.map(line)].join('\n');
}

export const figuresTable = (rows: Row[]) =>
  markdownTable(['Figure', 'Measured', 'Target', 'Floor', 'Ratio to floor', 'Verdict'], rows.map((r) => [r.figure, r.measured, r.target, r.floor, r.ratio, verdict(r.ok)]));

export const phasesTable = (phases: Phase[]) => markdownTable(['Phase', 'Seconds'], phases.map((p) => [p.phase, p.seconds.toFixed(1)]));

export function machine() {
  const cpu = /model name\s*:\s*(.+)/.exec(readFileSync('/proc/cpuinfo', 'utf8'))?.[1] ?? 'unknown';
  const free = spawnSync('free', ['-h'], { encoding: 'utf8' }).stdout.trim();
  const nproc = spawnSync('nproc', [], { encoding: 'utf8' }).stdout.trim() || String(availableParallelism());
  return { cpu, free, nproc, node: process.version };
}

export const load = () => loadavg().map((x) => x.toFixed(2)).join(' ');

// Formatting helpers for the table cells.
export const ms = (x: number | null | undefined) => (x == null || Number.isNaN(x) ? 'n/a' : x >= 1000 ? `${(x / 1000).toFixed(2)} s` : `${Math.round(x)} ms`);
export const ratio = (a: number | null | undefined, b: number | null | undefined) => (a == null || b == null || !b || Number.isNaN(a) ? 'n/a' : `${(a / b).toFixed(1)}×`);
export const mb = (bytes: number) => `${(bytes / 1_048_576).toFixed(0)} MB`;
export const kb = (bytes: number) => `${(bytes / 1024).toFixed(1)} KB`;
export const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length ? (s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2) : Number.NaN;
};
/** Nearest-rank percentile. */
export const percentile = (xs: number[], p: number) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length ? s[Math.min(s.length - 1, Math.ceil((p / 100) * s.length) - 1)] : Number.NaN;
};
