import { Router, type Request, type Response } from 'express';
import { eq } from 'drizzle-orm';
import type { AppContext } from '../app';
import type { BlobStore } from '../storage/types';
import { newBlobKey } from '../storage/keys';
import { currentUser, requireRole, signedIn } from '../middleware/auth';
import { validated } from '../middleware/validate';
import { singleUpload } from '../middleware/upload';
import { attachments } from '../db/schema';
import { audit } from '../audit';
import { badRequest, forbidden, notFound } from '../http-error';
import { IdParamsSchema } from '../../shared/schemas/common';
import {
  AttachmentFieldsSchema,
  AttachmentListQuerySchema,
  DEFAULT_UPLOAD_MAX_BYTES,
} from '../../shared/schemas/attachments';
import { canSeeSite } from '../../shared/domain/policies';
import { SELF_REMOVE_HOURS, canRemoveAttachment, inlineDisposition } from '../../shared/domain/attachments';
import { bikeSite, checkLinks, findAttachment, listAttachments, toAttachment } from '../services/attachments';
import { THUMB_MIME, inspectFile } from '../services/attachment-files';
import { log } from '../logger';

export interface AttachmentRouteOptions {
  /** The largest file accepted, in bytes (8 MB unless set). */
  maxBytes?: number;
}

export function attachmentRoutes(ctx: AppContext, store: BlobStore, opts: AttachmentRouteOptions = {}) {
  const r = Router();
  const db = ctx.database.db;
  const maxBytes = opts.maxBytes ?? DEFAULT_UPLOAD_MAX_BYTES;
  const logError = (line: string, err: unknown) => log.error({ err }, line);

  // Another site's bike answers as missing, so its existence is not given away.
  async function visibleBike(req: Request, bikeId: string) {
    const siteId = await bikeSite(db, bikeId);
    if (!siteId || !canSeeSite(currentUser(req), siteId)) throw notFound('That bike');
    return siteId;
  }

  async function visibleAttachment(req: Request, id: string) {
    const row = await findAttachment(db, id);
    if (!row || !canSeeSite(currentUser(req), row.bikeSiteId)) throw notFound('That photo or document');
    return row;
  }

  async function serve(res: Response, key: string, mime: string, disposition: string) {
    const bytes = await store.get(key);
    if (!bytes) throw notFound('The stored file');
    res.set({
      'Content-Type': mime,
      'Content-Disposition': disposition,
      'X-Content-Type-Options': 'nosniff',
      // Only the signed-in browser may keep a copy; shared caches must not.
      'Cache-Control': 'private, max-age=3600',
    });
    res.send(bytes);
  }

  r.post(
    '/bikes/:id/attachments',
    requireRole('desk', 'technician', 'manager'),
    // Checked before the body is read, so nobody can make the server buffer files for a bike they cannot see.
    ...validated({ params: IdParamsSchema }, async (req, res, v, next) => {
      res.locals.siteId = await visibleBike(req, v.params.id);
      next();
    }),
    singleUpload(maxBytes),
    // Parsed again after multer: the form fields are only there now.
    ...validated({ params: IdParamsSchema, body: AttachmentFieldsSchema }, async (req, res, v) => {
      const user = currentUser(req);
      const bikeId = v.params.id;
      const file = req.file;
      if (!file || file.size === 0)
        throw badRequest('Choose a photo or a PDF to upload.', [{ path: 'file', message: 'No file was sent.' }]);
      const links = v.body;
      await checkLinks(db, bikeId, links);
      const info = await inspectFile(file.buffer);
      const siteId = res.locals.siteId as string;

      const storageKey = newBlobKey();
      const thumbKey = info.thumb ? newBlobKey() : null;
      try {
        await store.put(storageKey, info.bytes, info.mime);
        if (thumbKey && info.thumb) await store.put(thumbKey, info.thumb, THUMB_MIME);
        const row = await db.transaction(async (tx) => {
          const [a] = await tx
            .insert(attachments)
            .values({
              siteId,
              bikeId,
              defectId: links.defectId ?? null,
              taskId: links.taskId ?? null,
              storageKey,
              thumbKey,
              mime: info.mime,
              bytes: info.bytes.length,
              width: info.width,
              height: info.height,
              originalName: file.originalname.replace(/\p{Cc}/gu, '').slice(0, 255) || null,
              uploadedBy: user.id,
              createdAt: ctx.now(),
            })
            .returning();
          await audit(tx, {
            userId: user.id,
            action: 'attach',
            entity: 'attachment',
            entityId: a.id,
            changes: { bikeId, defectId: a.defectId, taskId: a.taskId, mime: a.mime, bytes: a.bytes },
          });
          return a;
        });
        res.status(201).json({ attachment: toAttachment({ a: row, bikeSiteId: siteId, uploaderName: user.name }) });
      } catch (e) {
        // Nothing half-stored: files without a record would never be shown or removed.
        await Promise.allSettled([store.delete(storageKey), thumbKey ? store.delete(thumbKey) : undefined]);
        throw e;
      }
    }),
  );

  r.get('/bikes/:id/attachments', signedIn(), ...validated({ params: IdParamsSchema, query: AttachmentListQuerySchema }, async (req, res, v) => {
    await visibleBike(req, v.params.id);
    const rows = await listAttachments(db, v.params.id, v.query);
    res.json({ items: rows.map(toAttachment) });
  }));

  r.get('/attachments/:id', signedIn(), ...validated({ params: IdParamsSchema }, async (req, res, v) => {
    const { a } = await visibleAttachment(req, v.params.id);
    await serve(res, a.storageKey, a.mime, inlineDisposition(a.originalName, a.mime));
  }));

  r.get('/attachments/:id/thumb', signedIn(), ...validated({ params: IdParamsSchema }, async (req, res, v) => {
    const { a } = await visibleAttachment(req, v.params.id);
    if (!a.thumbKey) throw notFound('A preview of this file');
    await serve(res, a.thumbKey, THUMB_MIME, inlineDisposition(a.originalName, THUMB_MIME, '-preview'));
  }));

  r.delete('/attachments/:id', requireRole('desk', 'technician', 'manager'), ...validated({ params: IdParamsSchema }, async (req, res, v) => {
    const user = currentUser(req);
    const { a, bikeSiteId } = await visibleAttachment(req, v.params.id);
    if (!canRemoveAttachment(user, { siteId: bikeSiteId, uploadedBy: a.uploadedBy, createdAt: a.createdAt }, ctx.now()))
      throw forbidden(`Only a manager can remove this. You can remove a photo you added yourself for ${SELF_REMOVE_HOURS} hours.`);
    await db.transaction(async (tx) => {
      await tx.delete(attachments).where(eq(attachments.id, a.id));
      await audit(tx, { userId: user.id, action: 'delete', entity: 'attachment', entityId: a.id, changes: { bikeId: a.bikeId, mime: a.mime, bytes: a.bytes } });
    });
    // The record is gone first: a file left behind by a failed delete is never served.
    for (const key of [a.storageKey, a.thumbKey]) if (key) await store.delete(key).catch((e) => logError(`Could not delete the stored file ${key}`, e));
    res.status(204).end();
  }));

  return r;
}
