import { createServer } from 'node:http';
import { existsSync } from 'node:fs';
import { parseArgs } from 'node:util';
import express, { type Express } from 'express';
import { createApp } from '../server/app';
import { testConfig } from '../server/config';
import { openDatabase } from '../server/db/client';
import { lockDataDir } from '../server/db/data-dir-lock';
import { rawSql, statementRecorder } from './raw-sql';
import { scanParts, timedFloor, timedScan } from './scan-bench';
import { checkInTargets, countExisting, explain, readingCount, timedInsertFloor, timedListDue } from './direct-bench';

/**
 * The server under test, in its own process: the real app over the generated data, plus the
 * measurements that go straight to the database. The runner drives it over IPC.
 */

const { values } = parseArgs({ options: { data: { type: 'string' }, dist: { type: 'string' } } });
const databaseUrl = process.env.DATABASE_URL || undefined;
const unlock = databaseUrl ? () => {} : lockDataDir(values.data!, 'the Lashline benchmark');
const t0 = performance.now();
const database = await openDatabase(databaseUrl ? { databaseUrl } : { dataDir: values.data });
const openMs = performance.now() - t0;
const recorder = statementRecorder(database);
const raw = rawSql(database, databaseUrl);

const dist = values.dist;
const serveDist = (app: Express) => {
  if (!dist || !existsSync(`${dist}/index.html`)) return;
  app.use(express.static(dist, { index: false, maxAge: '1h' }));
  app.get('/{*splat}', (_req, res) => res.sendFile(`${dist}/index.html`));
};
const app = createApp({ database, config: testConfig({ LOG_LEVEL: 'error' }), sessionSecret: 'bench-session-secret-bench', client: serveDist });
let inFlight = 0;
const server = createServer((req, res) => {
  inFlight++;
  res.once('close', () => inFlight--);
  app(req, res);
});
await new Promise<void>((r) => server.listen(0, '127.0.0.1', () => r()));
const port = (server.address() as { port: number }).port;

const memory = () => {
  const m = process.memoryUsage();
  return { rss: m.rss, heapUsed: m.heapUsed, external: m.external, maxRss: process.resourceUsage().maxRSS * 1024 };
};

type Handler = (args: Record<string, unknown>) => Promise<unknown> | unknown;
const handlers: Record<string, Handler> = {
  scan: () => timedScan(database),
  scanParts: () => scanParts(database),
  floor: () => timedFloor(raw),
  listDue: (a) => timedListDue(database, { maxRuns: Number(a.maxRuns ?? 50), maxMs: Number(a.maxMs ?? 8000) }),
  checkInTargets: () => checkInTargets(raw),
  insertFloor: async (a) => timedInsertFloor(database, await checkInTargets(raw), { maxMs: Number(a.maxMs ?? 3000) }),
  readings: () => readingCount(raw),
  existing: (a) => countExisting(raw, a.ids as string[]),
  inFlight: () => inFlight,
  explain: (a) => explain(raw, String(a.sql), (a.params as unknown[]) ?? []),
  recordStart: () => recorder.start(),
  recordStop: () => recorder.stop(),
  memory,
  stop: async () => {
    server.closeAllConnections();
    await new Promise<void>((r) => server.close(() => r()));
    await raw.close();
    await database.close();
    unlock();
    setImmediate(() => process.exit(0));
  },
};

process.on('message', (m: { id: number; cmd: string; args?: Record<string, unknown> }) => {
  Promise.resolve()
    .then(() => {
      const h = handlers[m.cmd];
      if (!h) throw new Error(`No benchmark command ${m.cmd}`);
      return h(m.args ?? {});
    })
    .then(
      (result) => process.send!({ id: m.id, ok: true, result }),
      (e: unknown) => process.send!({ id: m.id, ok: false, error: e instanceof Error ? `${e.message}\n${e.stack}` : String(e) }),
    );
});
process.on('disconnect', () => {
  void database.close().finally(() => {
    unlock();
    process.exit(1);
  });
});
process.send!({ ready: true, port, openMs, memory: memory() });
