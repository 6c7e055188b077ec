import { resolve } from 'node:path';
import { readConfig } from '../server/config';
import { openDatabase } from '../server/db/client';
import { DataDirLockedError, lockDataDir, lockOwner } from '../server/db/data-dir-lock';
import { startMailCatcher } from '../server/mail/catcher';
import { createTransport } from '../server/mail/transport';
import { JOBS, JOB_NAMES, isJobName } from './registry';

/**
 * `npm run job -- <name>`: runs one job now and prints what it did. An embedded database belongs to
 * one process, so when a server holds the data directory the job is run by that server.
 */
async function main() {
  const name = process.argv[2] ?? '';
  if (!isJobName(name)) {
    console.error(`Usage: npm run job -- <${JOB_NAMES.join('|')}>`);
    process.exit(2);
  }
  const config = readConfig();
  const dataDir = resolve(config.DATA_DIR);
  if (!config.DATABASE_URL) {
    const owner = lockOwner(dataDir);
    if (owner?.port && owner.jobToken) {
      const res = await fetch(`http://${owner.host ?? '127.0.0.1'}:${owner.port}/api/admin/jobs/${name}/run`, {
        method: 'POST',
        headers: { 'x-lashline-job-token': owner.jobToken, 'content-type': 'application/json' },
        body: '{}',
      });
      const body = (await res.json()) as { result?: { summary: string }; error?: { message: string } };
      if (!res.ok) throw new Error(body.error?.message ?? `The server answered ${res.status}`);
      console.log(`${body.result!.summary} (run by the server, pid ${owner.pid})`);
      return;
    }
  }
  let unlock = () => {};
  try {
    if (!config.DATABASE_URL) unlock = lockDataDir(dataDir, `the job runner (${name})`);
  } catch (e) {
    if (e instanceof DataDirLockedError) {
      console.error(`${e.message}\nThe server holding it did not publish where it listens; stop it or run the job from its admin page.`);
      process.exit(2);
    }
    throw e;
  }
  const database = await openDatabase({ databaseUrl: config.DATABASE_URL, dataDir: config.DATABASE_URL ? undefined : dataDir });
  const catcher = config.SMTP_URL ? undefined : await startMailCatcher(database.db);
  try {
    const transport = createTransport(config.SMTP_URL, catcher?.port);
    const result = await JOBS[name]({
      db: database.db,
      now: () => new Date(),
      mail: { transport: () => transport, from: config.MAIL_FROM },
      publicUrl: config.PUBLIC_URL ?? `http://${config.HOST}:${config.PORT}`,
      log: (l) => console.log(l),
    });
    console.log(result.summary);
  } finally {
    await catcher?.close();
    await database.close();
    unlock();
  }
}

main().catch((e) => {
  console.error(e instanceof Error ? e.message : e);
  process.exit(1);
});
