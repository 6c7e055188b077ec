import { existsSync, mkdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { PGlite } from '@electric-sql/pglite';
import type { PgDatabase, PgQueryResultHKT } from 'drizzle-orm/pg-core';
import { drizzle as drizzlePglite } from 'drizzle-orm/pglite';
import { migrate as migratePglite } from 'drizzle-orm/pglite/migrator';
import { drizzle as drizzlePg } from 'drizzle-orm/node-postgres';
import { migrate as migratePg } from 'drizzle-orm/node-postgres/migrator';
import pg from 'pg';
import * as schema from './schema';
import { log } from '../logger';

export type Db = PgDatabase<PgQueryResultHKT, typeof schema>;
export type DbKind = 'pglite' | 'postgres';

export interface Database {
  db: Db;
  kind: DbKind;
  /** The PGlite instance when embedded (for backups and data-directory dumps). */
  pglite?: PGlite;
  /** The connection pool on PostgreSQL, for work that must hold one connection of its own (claimed job runs). */
  pool?: pg.Pool;
  /**
   * Commit notifications, on embedded PGlite only: there this process is the database's one user and
   * a notification reaches its listeners before the committing call returns, so memory kept in step
   * with them is never behind the database. On a PostgreSQL server they would arrive later, over
   * another connection, so nothing is kept there.
   */
  changes?: ChangeFeed;
  close(): Promise<void>;
}

/** 'lashline_data': the data scopes a commit moved on; 'lashline_session': a session id changed or gone, or '*'. */
export type ChangeChannel = 'lashline_data' | 'lashline_session';
export interface ChangeFeed {
  on(channel: ChangeChannel, listener: (payload: string) => void): () => void;
}

/** PGlite's LISTEN: one per channel, fanned out to the listeners in this process. */
async function pgliteChanges(client: PGlite): Promise<ChangeFeed> {
  const listeners = new Map<ChangeChannel, Set<(payload: string) => void>>();
  for (const channel of ['lashline_data', 'lashline_session'] as const) {
    const set = new Set<(payload: string) => void>();
    listeners.set(channel, set);
    await client.listen(channel, (payload) => {
      for (const l of set) l(payload);
    });
  }
  return {
    on(channel, listener) {
      const set = listeners.get(channel)!;
      set.add(listener);
      return () => set.delete(listener);
    },
  };
}

/** drizzle/ of the project this code runs from: as TypeScript in server/db/, or compiled into build/server/. */
export const MIGRATIONS_FOLDER = projectFolder('drizzle');

function projectFolder(name: string) {
  for (let dir = dirname(fileURLToPath(import.meta.url)); ; dir = dirname(dir)) {
    if (existsSync(join(dir, 'package.json')) && existsSync(join(dir, name))) return join(dir, name);
    if (dirname(dir) === dir) throw new Error(`No ${name}/ folder above ${fileURLToPath(import.meta.url)}: run Lashline from its project folder.`);
  }
}

export interface OpenOptions {
  databaseUrl?: string;
  /** Directory for an on-disk PGlite; omitted means in memory. */
  dataDir?: string;
  /** A dumped, already-migrated PGlite data directory to start from (tests). */
  loadDataDir?: Blob | File;
  migrate?: boolean;
}

/** PGlite's shared_buffers (PostgreSQL's default is 128MB). */
export const PGLITE_SHARED_BUFFERS = '32MB';

export async function openDatabase(opts: OpenOptions): Promise<Database> {
  if (opts.databaseUrl) {
    const pool = new pg.Pool({ connectionString: opts.databaseUrl, max: 10 });
    // An idle connection the server ends (restart, administrator command) is dropped from the pool
    // and replaced on the next query; without a listener it would end the process.
    pool.on('error', (err) => log.warn({ err }, 'An idle database connection ended; it is dropped from the pool.'));
    const db = drizzlePg({ client: pool, schema }) as unknown as Db;
    if (opts.migrate !== false) await migratePg(db as never, { migrationsFolder: MIGRATIONS_FOLDER });
    return { db, kind: 'postgres', pool, close: () => pool.end() };
  }
  if (opts.dataDir) mkdirSync(opts.dataDir, { recursive: true });
  // PostgreSQL's own page cache lives inside PGlite's WebAssembly memory, which never shrinks; the
  // operating system caches the data files as well, so a smaller one keeps the server's memory down.
  const conf = { postgresqlconf: [`shared_buffers = ${PGLITE_SHARED_BUFFERS}`] };
  const client = opts.dataDir
    ? new PGlite(`${opts.dataDir}/pglite`, conf)
    : new PGlite(opts.loadDataDir ? { loadDataDir: opts.loadDataDir, ...conf } : conf);
  await client.waitReady;
  const db = drizzlePglite({ client, schema }) as unknown as Db;
  if (opts.migrate !== false) await migratePglite(db as never, { migrationsFolder: MIGRATIONS_FOLDER });
  return { db, kind: 'pglite', pglite: client, changes: await pgliteChanges(client), close: () => client.close() };
}

/** A transaction handle; code that must run inside or outside a transaction takes `DbOrTx`. */
export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];
export type DbOrTx = Db | Tx;
