import { createWriteStream } from 'node:fs';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Transform } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { Router, type Request } from 'express';
import type { AppContext } from '../app';
import { currentUser, requireRole } from '../middleware/auth';
import { validated } from '../middleware/validate';
import { BackupFormatSchema, RESTORE_MAX_BYTES } from '../../shared/schemas/imports';
import { HttpError, badRequest } from '../http-error';
import type { BlobStore } from '../storage/types';
import { restore, writeBackup, type BackupDeps } from '../services/backup';
import { log } from '../logger';

const stamp = (d: Date) => d.toISOString().slice(0, 16).replace(/[-:]/g, '').replace('T', '-');
const GB = 1024 * 1024 * 1024;
const tooLarge = () => new HttpError(413, 'payload_too_large', `The backup is larger than ${RESTORE_MAX_BYTES / GB} GB, the most a restore accepts.`);

/** Writes the request body to `path`, refusing more than the restore limit; answers its length. */
async function receive(req: Request, path: string) {
  if (Number(req.headers['content-length'] ?? 0) > RESTORE_MAX_BYTES) throw tooLarge();
  let n = 0;
  const limit = new Transform({
    transform(chunk: Buffer, _enc, done) {
      n += chunk.length;
      done(n > RESTORE_MAX_BYTES ? tooLarge() : null, chunk);
    },
  });
  await pipeline(req, limit, createWriteStream(path, { mode: 0o600 }));
  return n;
}

export function backupRoutes(ctx: AppContext, store: BlobStore) {
  const r = Router();
  const { database } = ctx;
  const deps: BackupDeps = {
    database,
    store,
    log: (line, err) => log.error({ err }, line),
  };

  // One archive: the database (its data directory on PGlite; the portable JSON dump on PostgreSQL or
  // with ?format=json) and every stored photo, preview and document, streamed as it is read.
  r.get('/admin/backup', requireRole('admin'), ...validated({ query: BackupFormatSchema }, async (req, res, v) => {
    const asked = v.query.format;
    const format = asked ?? (database.pglite ? 'data-dir' : 'json');
    if (format === 'data-dir' && !database.pglite) throw badRequest('This server runs on PostgreSQL: its backup holds the JSON dump.', [{ path: 'query.format', message: 'Use json.' }]);
    const now = ctx.now();
    res.setHeader('Content-Type', 'application/gzip');
    res.setHeader('Content-Disposition', `attachment; filename="lashline-backup-${stamp(now)}${format === 'json' ? '-json' : ''}.tar.gz"`);
    try {
      const manifest = await writeBackup(deps, format, now, currentUser(req).id, res);
      if (manifest.missing.length) deps.log(`[backup] ${manifest.missing.length} files named by attachment records were not in the store: ${manifest.missing.join(', ')}`);
    } catch (e) {
      // Once bytes have left, the only honest answer is a cut-short file, which a restore refuses.
      if (!res.headersSent) {
        res.removeHeader('Content-Disposition');
        throw e;
      }
      deps.log('[backup] the backup stopped part-way', e);
      res.destroy();
    }
  }));

  r.post('/admin/restore', requireRole('admin'), async (req, res) => {
    // A JSON body would already have been read by the API's JSON parser: the file travels as bytes.
    if (req.body !== undefined) throw badRequest('Send the backup file itself as the request body, as application/octet-stream.', [{ path: 'file', message: 'No file.' }]);
    const dir = await mkdtemp(join(tmpdir(), 'lashline-restore-'));
    try {
      const path = join(dir, 'backup');
      if (!(await receive(req, path))) throw badRequest('Send the backup file itself as the request body, as application/octet-stream.', [{ path: 'file', message: 'No file.' }]);
      const report = await restore(deps, path, dir, currentUser(req).id);
      // Every session was cleared with the data; this one must not be written back at the end of the response.
      await new Promise<void>((done) => req.session.destroy(() => done()));
      res.json(report);
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });
  return r;
}
