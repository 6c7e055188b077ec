import type { Statement } from './raw-sql';
import type { Worker } from './worker-client';
import { markdownTable } from './report';

export interface StatementGroup {
  sql: string;
  n: number;
  ms: number;
  rows: number;
  slowest: Statement;
}

export interface Probe {
  label: string;
  wallMs: number;
  statements: Statement[];
  groups: StatementGroup[];
  plan?: string;
}

/** Statements grouped by their text, slowest first. */
export function group(statements: Statement[]): StatementGroup[] {
  const by = new Map<string, StatementGroup>();
  for (const s of statements) {
    const g = by.get(s.sql) ?? { sql: s.sql, n: 0, ms: 0, rows: 0, slowest: s };
    g.n++;
    g.ms += s.ms;
    g.rows += s.rows;
    if (s.ms > g.slowest.ms) g.slowest = s;
    by.set(s.sql, g);
  }
  return [...by.values()].sort((a, b) => b.ms - a.ms);
}

/** Records the statements one piece of work sends, then plans the slowest SELECT among them. */
export async function probe(w: Worker, label: string, work: () => Promise<unknown>): Promise<Probe> {
  await w.call('recordStart');
  const t0 = performance.now();
  await work();
  const wallMs = performance.now() - t0;
  const statements = await w.call<Statement[]>('recordStop');
  const groups = group(statements);
  const slowSelect = groups.find((g) => /^\s*select\b/i.test(g.sql));
  const plan = slowSelect ? await w.call<string>('explain', { sql: slowSelect.slowest.sql, params: slowSelect.slowest.params }).catch((e: Error) => `EXPLAIN failed: ${e.message.split('\n')[0]}`) : undefined;
  return { label, wallMs, statements, groups, plan };
}

export const short = (sql: string, n = 110) => {
  const one = sql.replace(/\s+/g, ' ').replace(/"/g, '');
  return one.length > n ? `${one.slice(0, n)}…` : one;
};

export function probeMarkdown(p: Probe, top = 6): string {
  const sqlMs = p.statements.reduce((s, x) => s + x.ms, 0);
  const rows = p.groups.slice(0, top).map((g) => [g.ms.toFixed(0), String(g.n), String(g.rows), `\`${short(g.sql).replace(/\|/g, '\\|')}\``]);
  const plan = p.plan ? `\n\nPlan of the slowest SELECT (EXPLAIN ANALYZE, BUFFERS):\n\n\`\`\`\n${trimPlan(p.plan)}\n\`\`\`` : '';
  return `#### ${p.label}\n\n${Math.round(p.wallMs)} ms wall, ${p.statements.length} statements taking ${Math.round(sqlMs)} ms in all.\n\n` +
    `${markdownTable(['ms', 'times', 'rows', 'statement'], rows)}${plan}`;
}

/** The plan's first lines and its timing summary: enough to see the scan or sort that costs. */
function trimPlan(plan: string, max = 30) {
  const lines = plan.split('\n').map((l) => (l.length > 220 ? `${l.slice(0, 220)}…` : l));
  if (lines.length <= max) return lines.join('\n');
  return [...lines.slice(0, max - 3), `  … ${lines.length - max + 1} more lines …`, ...lines.slice(-2)].join('\n');
}
