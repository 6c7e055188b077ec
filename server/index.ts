import { createServer } from 'node:http';
import { randomBytes } from 'node:crypto';
import { existsSync } from 'node:fs';
import { resolve } from 'node:path';
import express, { type Express } from 'express';
import { readConfig } from './config';
import { openDatabase } from './db/client';
import { DataDirLockedError, lockDataDir } from './db/data-dir-lock';
import { createApp } from './app';
import { sessionSecret } from './secrets';
import { seedDemo } from './demo/seed';
import { needsSetup } from './services/accounts';
import { replanIdle } from './services/replan';
import type { MailCatcher } from './mail/catcher';
import { createTransport } from './mail/transport';
import { startScheduler } from '../jobs';
import { slotClaimer } from '../jobs/claim';
import { updateLock } from './db/data-dir-lock';
import { createBlobStore, uploadMaxBytesFromEnv } from './storage';
import { log } from './logger';

const args = new Set(process.argv.slice(2));
const dev = args.has('--dev');
if (dev) process.env.NODE_ENV = 'development';

async function main() {
  const config = readConfig();
  const dataDir = resolve(config.DATA_DIR);
  let unlock = () => {};
  if (!config.DATABASE_URL) {
    try {
      unlock = lockDataDir(dataDir);
    } catch (e) {
      if (e instanceof DataDirLockedError) {
        // For whoever started it, on the terminal's error stream: this process never became a server.
        process.stderr.write(`${e.message}\n`);
        process.exit(2);
      }
      throw e;
    }
  }
  const database = await openDatabase({ databaseUrl: config.DATABASE_URL, dataDir: config.DATABASE_URL ? undefined : dataDir });
  if (args.has('--demo') && (await needsSetup(database.db))) {
    const summary = await seedDemo(database.db, { password: config.DEMO_PASSWORD });
    log.info(`Demo scenario loaded: ${summary}`);
  }
  // Without an SMTP server, mail goes to the built-in catcher and shows on the admin's mail page.
  let catcher: MailCatcher | undefined;
  // Loaded only then: a server with a real mail server does not hold the SMTP receiver in memory.
  if (!config.SMTP_URL) catcher = await (await import('./mail/catcher')).startMailCatcher(database.db, config.MAIL_CATCHER_PORT);
  const transport = createTransport(config.SMTP_URL, catcher?.port);
  const blobStore = createBlobStore(process.env, dataDir);
  const jobToken = randomBytes(24).toString('base64url');
  const httpServer = createServer();
  const app = createApp({
    jobToken,
    blobStore,
    uploadMaxBytes: uploadMaxBytesFromEnv(process.env),
    database,
    config,
    sessionSecret: await sessionSecret(database.db, config.SESSION_SECRET),
    mail: { transport: () => transport, from: config.MAIL_FROM },
    client: dev ? undefined : serveBuiltClient,
  });
  if (dev) await mountVite(app, httpServer);
  httpServer.on('request', app);
  await new Promise<void>((r) => httpServer.listen(config.PORT, config.HOST, () => r()));
  const port = (httpServer.address() as { port: number }).port;
  const where = config.DATABASE_URL ? 'PostgreSQL' : `embedded PGlite in ${dataDir}`;
  // Command-line jobs find the running server through the lock file and ask it to do the work.
  if (!config.DATABASE_URL) updateLock(dataDir, { port, host: config.HOST, jobToken });
  log.info(`Lashline listening on http://${config.HOST}:${port} (${where})${catcher ? `; mail caught on 127.0.0.1:${catcher.port}` : ''}`);

  const scheduler =
    config.SCHEDULER === 'on'
      ? startScheduler(
          { db: database.db, now: () => new Date(), mail: { transport: () => transport, from: config.MAIL_FROM }, publicUrl: config.PUBLIC_URL ?? `http://${config.HOST}:${port}`, log: (l) => log.info(l) },
          [
            { job: 'due-scan', cron: config.DUE_SCAN_CRON, timeZone: config.SCHEDULE_TZ, catchUp: true },
            { job: 'weekly-digest', cron: config.DIGEST_CRON, timeZone: config.SCHEDULE_TZ, catchUp: true },
            { job: 'deliver-mail', cron: config.MAIL_RETRY_CRON, timeZone: config.SCHEDULE_TZ, catchUp: false },
            { job: 'booking-sync', cron: config.BOOKING_SYNC_CRON, timeZone: config.SCHEDULE_TZ, catchUp: true },
          ],
          slotClaimer(database),
        )
      : null;

  let stopping = false;
  const stop = async (signal: string) => {
    if (stopping) return;
    stopping = true;
    log.info(`${signal}: finishing requests in flight, then closing the database.`);
    const force = setTimeout(() => {
      log.warn('Requests still open after 10 s; closing anyway.');
      httpServer.closeAllConnections();
    }, 10_000);
    force.unref();
    await scheduler?.stop();
    await new Promise<void>((r) => httpServer.close(() => r()));
    await scheduler?.catchUp.catch(() => {});
    await replanIdle(database.db);
    await catcher?.close();
    await database.close();
    unlock();
    process.exit(0);
  };
  process.on('SIGTERM', () => void stop('SIGTERM'));
  process.on('SIGINT', () => void stop('SIGINT'));
}

function serveBuiltClient(app: Express) {
  const dist = resolve('dist');
  if (!existsSync(`${dist}/index.html`)) {
    log.warn('No client build in dist/: run `npm run build` first. The API still answers under /api.');
    return;
  }
  // Vite names built files by their content hash: a browser may keep them for good.
  app.use('/assets', express.static(`${dist}/assets`, { index: false, immutable: true, maxAge: '365d' }));
  // A file an older page asks for after an update: say it is gone rather than send the page.
  app.use('/assets', (_req, res) => res.status(404).type('text/plain').send('Not found: reload the page to get the current version.'));
  // The service worker, its manifest and the page are asked for afresh each time: that is how a
  // tablet learns a new version exists.
  const fresh = new Set(['/sw.js', '/manifest.webmanifest', '/index.html']);
  app.use(
    express.static(dist, {
      index: false,
      maxAge: '1h',
      setHeaders: (res, path) => {
        if (fresh.has(path.slice(dist.length).replaceAll('\\', '/'))) res.setHeader('Cache-Control', 'no-cache');
      },
    }),
  );
  app.get('/{*splat}', (_req, res) => res.sendFile(`${dist}/index.html`, { headers: { 'Cache-Control': 'no-cache' } }));
}

async function mountVite(app: Express, httpServer: ReturnType<typeof createServer>) {
  const { createServer: createVite } = await import('vite');
  const vite = await createVite({ server: { middlewareMode: true, hmr: { server: httpServer } }, appType: 'spa' });
  app.use(vite.middlewares);
}

main().catch((e) => {
  log.fatal(e instanceof Error ? { err: e } : { reason: e }, 'Lashline could not start.');
  process.exit(1);
});
