import { and, desc, eq, type SQL } from 'drizzle-orm';
import type { Db } from '../db/client';
import { attachments, bikes, defects, serviceTasks, users } from '../db/schema';
import type { Attachment, AttachmentFields } from '../../shared/schemas/attachments';
import { safeFileName } from '../../shared/domain/attachments';
import { badRequest } from '../http-error';

const columns = {
  a: attachments,
  // The bike's site now, not the one at upload: a bike that moves takes its photos along.
  bikeSiteId: bikes.siteId,
  uploaderName: users.name,
};
export type AttachmentRow = { a: typeof attachments.$inferSelect; bikeSiteId: string; uploaderName: string | null };

const select = (db: Db) =>
  db.select(columns).from(attachments).innerJoin(bikes, eq(bikes.id, attachments.bikeId)).leftJoin(users, eq(users.id, attachments.uploadedBy));

export async function findAttachment(db: Db, id: string): Promise<AttachmentRow | undefined> {
  const [row] = await select(db).where(eq(attachments.id, id));
  return row;
}

export async function listAttachments(db: Db, bikeId: string, f: AttachmentFields): Promise<AttachmentRow[]> {
  const where: SQL[] = [eq(attachments.bikeId, bikeId)];
  if (f.defectId) where.push(eq(attachments.defectId, f.defectId));
  if (f.taskId) where.push(eq(attachments.taskId, f.taskId));
  return select(db)
    .where(and(...where))
    .orderBy(desc(attachments.createdAt), desc(attachments.id));
}

export async function bikeSite(db: Db, bikeId: string): Promise<string | undefined> {
  const [b] = await db.select({ siteId: bikes.siteId }).from(bikes).where(eq(bikes.id, bikeId));
  return b?.siteId;
}

/** A defect or task named beside an upload must be one of this bike's. */
export async function checkLinks(db: Db, bikeId: string, f: AttachmentFields) {
  if (f.defectId) {
    const [d] = await db.select({ bikeId: defects.bikeId }).from(defects).where(eq(defects.id, f.defectId));
    if (d?.bikeId !== bikeId)
      throw badRequest('That defect is not on this bike. Attach the photo from the bike it was reported on.', [{ path: 'defectId', message: 'Not a defect of this bike.' }]);
  }
  if (f.taskId) {
    const [t] = await db.select({ bikeId: serviceTasks.bikeId }).from(serviceTasks).where(eq(serviceTasks.id, f.taskId));
    if (t?.bikeId !== bikeId)
      throw badRequest('That task is not on this bike. Attach the photo from the bike’s own task card.', [{ path: 'taskId', message: 'Not a task of this bike.' }]);
  }
}

export function toAttachment({ a, bikeSiteId, uploaderName }: AttachmentRow): Attachment {
  return {
    id: a.id,
    bikeId: a.bikeId,
    siteId: bikeSiteId,
    defectId: a.defectId,
    taskId: a.taskId,
    kind: a.mime === 'application/pdf' ? 'document' : 'photo',
    mime: a.mime,
    bytes: a.bytes,
    width: a.width,
    height: a.height,
    name: safeFileName(a.originalName, a.mime),
    uploadedBy: a.uploadedBy,
    uploaderName,
    createdAt: a.createdAt.toISOString(),
    url: `/api/attachments/${a.id}`,
    thumbUrl: a.thumbKey ? `/api/attachments/${a.id}/thumb` : null,
  };
}
