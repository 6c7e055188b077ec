import pg from 'pg';
import type { Database } from '../server/db/client';

/** Plain SQL with parameters on either engine, for the floors and the query plans. */
export interface RawSql {
  query<T = Record<string, unknown>>(text: string, params?: unknown[]): Promise<T[]>;
  close(): Promise<void>;
}

export function rawSql(database: Database, databaseUrl?: string): RawSql {
  if (database.pglite) {
    const db = database.pglite;
    return { query: async <T>(text: string, params: unknown[] = []) => (await db.query<T>(text, params)).rows, close: async () => {} };
  }
  const pool = new pg.Pool({ connectionString: databaseUrl, max: 2 });
  return {
    query: async <T>(text: string, params: unknown[] = []) => (await pool.query(text, params)).rows as T[],
    close: () => pool.end(),
  };
}

export interface Statement {
  sql: string;
  params: unknown[];
  ms: number;
  rows: number;
  /** When it was sent, on the server's clock (performance.now()). */
  at: number;
}

type QueryFn = (text: unknown, params?: unknown, opts?: unknown) => Promise<{ rows?: unknown[] }>;

/**
 * Times every statement the app sends while a recording is on: PGlite's query and the query of
 * its transaction handles, or node-postgres' promise-style query (a callback-style call is the pool
 * handing the statement to a client, which is then timed once).
 */
export function statementRecorder(database: Database) {
  let log: Statement[] | null = null;
  const timed = (fn: QueryFn): QueryFn =>
    async function (this: unknown, text, params, opts) {
      if (!log || typeof params === 'function' || typeof opts === 'function') return fn.call(this, text, params, opts);
      const t0 = performance.now();
      const r = await fn.call(this, text, params, opts);
      const sql = typeof text === 'string' ? text : String((text as { text?: string }).text ?? '');
      const values = Array.isArray(params) ? params : ((text as { values?: unknown[] }).values ?? []);
      log?.push({ sql, params: values, ms: performance.now() - t0, rows: r?.rows?.length ?? 0, at: t0 });
      return r;
    };
  // The instrumented methods are typed per driver; the wrappers only pass their arguments through.
  if (database.pglite) {
    const db = database.pglite as unknown as { query: QueryFn; transaction: (cb: (tx: { query: QueryFn }) => unknown) => Promise<unknown> };
    db.query = timed(db.query.bind(db));
    const transaction = db.transaction.bind(db);
    db.transaction = (cb) =>
      transaction((tx) => {
        const wrapped = Object.create(tx) as { query: QueryFn };
        wrapped.query = timed(tx.query);
        return cb(wrapped);
      });
  } else {
    for (const proto of [pg.Pool.prototype, pg.Client.prototype] as unknown as { query: QueryFn }[]) proto.query = timed(proto.query);
  }
  return {
    start: () => {
      log = [];
    },
    stop: (): Statement[] => {
      const l = log ?? [];
      log = null;
      return l;
    },
  };
}
