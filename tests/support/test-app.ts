import request from 'supertest';
import type { Express } from 'express';
import { sql } from 'drizzle-orm';
import { createApp } from '../../server/app';
import { openDatabase, type Database } from '../../server/db/client';
import { testConfig, type Config } from '../../server/config';
import { startMailCatcher, type MailCatcher } from '../../server/mail/catcher';
import { createTransport } from '../../server/mail/transport';
import { replanIdle } from '../../server/services/replan';

let template: Promise<Blob> | undefined;

// Starting and migrating PGlite takes seconds: migrate once per test file, then start each
// database from a dump of that migrated directory.
async function migratedTemplate() {
  template ??= (async () => {
    const d = await openDatabase({});
    const blob = await d.pglite!.dumpDataDir('none');
    await d.close();
    return blob;
  })();
  return template;
}

/** A fresh, migrated database: in-memory PGlite, or the PostgreSQL server in TEST_DATABASE_URL. */
export async function testDatabase(): Promise<Database> {
  if (process.env.LASHLINE_TEST_DB === 'postgres') {
    const url = process.env.TEST_DATABASE_URL!;
    const d = await openDatabase({ databaseUrl: url });
    await d.db.execute(sql`select 1`);
    await truncateAll(d);
    return d;
  }
  return openDatabase({ loadDataDir: await migratedTemplate(), migrate: false });
}

async function truncateAll(d: Database) {
  const { rows } = (await d.db.execute(
    // The data version row stays: it is part of the migrated schema, as on a new database.
    sql`select tablename from pg_tables where schemaname = 'public' and tablename <> 'data_versions'`,
  )) as unknown as { rows: { tablename: string }[] };
  if (rows.length) await d.db.execute(sql.raw(`truncate ${rows.map((r) => `"${r.tablename}"`).join(', ')} cascade`));
}

export interface TestContext {
  app: Express;
  database: Database;
  catcher?: MailCatcher;
  /** Settles once the re-plans that writes started in the background have finished. */
  settled(): Promise<void>;
  close(): Promise<void>;
}

export interface TestAppOptions {
  config?: Partial<Config>;
  now?: () => Date;
  /** Start the built-in mail catcher and send mail through it. */
  withMail?: boolean;
  jobToken?: string;
}

export async function testApp(opts: TestAppOptions = {}): Promise<TestContext> {
  const database = await testDatabase();
  const catcher = opts.withMail ? await startMailCatcher(database.db) : undefined;
  const transport = catcher ? createTransport(undefined, catcher.port) : undefined;
  const config = testConfig(opts.config);
  const app = createApp({
    database,
    config,
    sessionSecret: 'test-secret-test-secret',
    now: opts.now,
    jobToken: opts.jobToken,
    mail: transport ? { transport: () => transport, from: config.MAIL_FROM } : undefined,
  });
  return {
    app,
    database,
    catcher,
    settled: () => replanIdle(database.db),
    close: async () => {
      await replanIdle(database.db);
      await catcher?.close();
      await database.close();
    },
  };
}

/** A clock the test moves by hand. */
export function manualClock(start: string) {
  let t = new Date(start).getTime();
  return {
    now: () => new Date(t),
    set: (iso: string) => {
      t = new Date(iso).getTime();
    },
    advance: (ms: number) => {
      t += ms;
    },
  };
}

/** A supertest agent that keeps its cookie and sends the CSRF token on every unsafe request. */
export async function agent(app: Express) {
  const a = request.agent(app);
  let token = (await a.get('/api/auth/csrf')).body.token as string;
  const wrap = (method: 'post' | 'put' | 'patch' | 'delete') => (url: string) => a[method](url).set('x-csrf-token', token);
  return {
    raw: a,
    get: (url: string) => a.get(url),
    post: wrap('post'),
    put: wrap('put'),
    patch: wrap('patch'),
    delete: wrap('delete'),
    async login(email: string, password: string) {
      const res = await a.post('/api/auth/login').set('x-csrf-token', token).send({ email, password });
      if (res.status === 200) token = res.body.csrfToken;
      return res;
    },
    get token() {
      return token;
    },
  };
}
export type Agent = Awaited<ReturnType<typeof agent>>;

