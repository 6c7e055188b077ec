import express, { Router } from 'express';
import type { AppContext } from '../app';
import { currentUser, requireRole } from '../middleware/auth';
import { validate } from '../middleware/validate';
import { BackupFormatSchema, RESTORE_MAX_BYTES } from '../../shared/schemas/imports';
import { audit } from '../audit';
import { badRequest } from '../http-error';
import { jsonDump, restore } from '../services/backup';

const stamp = (d: Date) => d.toISOString().slice(0, 16).replace(/[-:]/g, '').replace('T', '-');

export function backupRoutes(ctx: AppContext) {
  const r = Router();
  const { database } = ctx;

  // The embedded database downloads as its data directory; PostgreSQL (or ?format=json) as a portable JSON dump.
  r.get('/admin/backup', requireRole('admin'), validate({ query: BackupFormatSchema }), async (req, res) => {
    const asked = (req.valid.query as { format?: 'data-dir' | 'json' }).format;
    const format = asked ?? (database.pglite ? 'data-dir' : 'json');
    if (format === 'data-dir' && !database.pglite) throw badRequest('This server runs on PostgreSQL: its backup is the JSON dump.', [{ path: 'query.format', message: 'Use json.' }]);
    const now = ctx.now();
    const body = format === 'data-dir' ? Buffer.from(await (await database.pglite!.dumpDataDir('gzip')).arrayBuffer()) : Buffer.from(await jsonDump(database, now));
    await audit(database.db, { userId: currentUser(req).id, action: 'backup', entity: 'database', changes: { format, bytes: body.length } });
    res.setHeader('Content-Type', format === 'data-dir' ? 'application/gzip' : 'application/json; charset=utf-8');
    res.setHeader('Content-Disposition', `attachment; filename="lashline-backup-${stamp(now)}.${format === 'data-dir' ? 'tar.gz' : 'json'}"`);
    res.send(body);
  });

  r.post('/admin/restore', requireRole('admin'), express.raw({ type: () => true, limit: RESTORE_MAX_BYTES }), async (req, res) => {
    // A JSON body would already have been read by the API's JSON parser: the file travels as bytes.
    if (!Buffer.isBuffer(req.body) || !req.body.length)
      throw badRequest('Send the backup file itself as the request body, as application/octet-stream.', [{ path: 'file', message: 'No file.' }]);
    const report = await restore(database, req.body, currentUser(req).id);
    // Every session was cleared with the data; this one must not be written back at the end of the response.
    await new Promise<void>((done) => req.session.destroy(() => done()));
    res.json(report);
  });
  return r;
}
