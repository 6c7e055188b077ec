import type { PGlite } from '@electric-sql/pglite';
import pg from 'pg';
import type { Cell, TableSpec } from './tables';

/** Writes whole batches of rows inside one transaction that the caller opens and closes. */
export interface BulkTarget {
  exec(sql: string): Promise<void>;
  rows<T>(sql: string): Promise<T[]>;
  load(t: TableSpec, rows: Cell[][]): Promise<void>;
  close(): Promise<void>;
}

// COPY text format: tab between columns, \N for null, backslash escapes (PostgreSQL manual, "COPY", File Formats).
const escapeText = (s: string) => s.replace(/[\\\t\n\r]/g, (c) => (c === '\\' ? '\\\\' : c === '\t' ? '\\t' : c === '\n' ? '\\n' : '\\r'));
const copyCell = (v: Cell) => (v === null ? '\\N' : typeof v === 'boolean' ? (v ? 't' : 'f') : typeof v === 'number' ? String(v) : escapeText(v));

/** PGlite: `COPY … FROM '/dev/blob'` reads the rows from a Blob handed to the query. */
export function pgliteTarget(db: PGlite): BulkTarget {
  return {
    exec: async (sql) => {
      await db.exec(sql);
    },
    rows: async <T>(sql: string) => (await db.query<T>(sql)).rows,
    async load(t, rows) {
      if (!rows.length) return;
      const lines = new Array<string>(rows.length);
      for (let i = 0; i < rows.length; i++) lines[i] = rows[i].map(copyCell).join('\t');
      const blob = new Blob([lines.join('\n'), '\n']);
      await db.query(`COPY ${t.name} (${t.columns.map((c) => c.name).join(', ')}) FROM '/dev/blob'`, [], { blob });
    },
    close: async () => {},
  };
}

const UNNEST_BATCH = 20_000;

/** PostgreSQL: one `INSERT … SELECT FROM unnest($1::type[], …)` per batch, a column per array parameter. */
export async function postgresTarget(url: string): Promise<BulkTarget> {
  const client = new pg.Client({ connectionString: url });
  client.on('error', (err) => console.warn(`[bulk-load] connection ended: ${err.message}`));
  await client.connect();
  return {
    exec: async (sql) => {
      await client.query(sql);
    },
    rows: async <T>(sql: string) => (await client.query(sql)).rows as T[],
    async load(t, rows) {
      const cols = t.columns.map((c) => c.name).join(', ');
      const arrays = t.columns.map((c, i) => `$${i + 1}::${c.type}[]`).join(', ');
      const text = `INSERT INTO ${t.name} (${cols}) SELECT * FROM unnest(${arrays})`;
      for (let at = 0; at < rows.length; at += UNNEST_BATCH) {
        const part = rows.slice(at, at + UNNEST_BATCH);
        await client.query(text, t.columns.map((_, i) => part.map((r) => r[i])));
      }
    },
    close: () => client.end(),
  };
}
