import { z } from 'zod';
import { IdSchema } from './common';

export const DEFAULT_UPLOAD_MAX_BYTES = 8 * 1024 * 1024;

/** What an upload may be, decided from its content: photos a phone or camera makes, and PDF documents. */
export const PHOTO_TYPES = ['image/jpeg', 'image/png', 'image/webp', 'image/heic', 'image/heif'] as const;
export const DOCUMENT_TYPES = ['application/pdf'] as const;
export type AttachmentMime = (typeof PHOTO_TYPES)[number] | (typeof DOCUMENT_TYPES)[number];

export const ACCEPT_ATTRIBUTE = 'image/*,application/pdf';
export const WRONG_TYPE_MESSAGE = 'Upload a photo (JPEG, PNG, WebP) or a PDF.';

const optionalId = z.preprocess((v) => (v === '' ? undefined : v), IdSchema.optional());

/** The text fields sent beside the file in the multipart form. */
export const AttachmentFieldsSchema = z.object({ defectId: optionalId, taskId: optionalId });
export type AttachmentFields = z.infer<typeof AttachmentFieldsSchema>;

export const AttachmentListQuerySchema = AttachmentFieldsSchema;
export type AttachmentListQuery = AttachmentFields;

export const AttachmentSchema = z.object({
  id: IdSchema,
  bikeId: IdSchema,
  /** The bike's site, for deciding on the client who may remove the file. */
  siteId: IdSchema,
  defectId: IdSchema.nullable(),
  taskId: IdSchema.nullable(),
  kind: z.enum(['photo', 'document']),
  mime: z.string(),
  bytes: z.number().int(),
  width: z.number().int().nullable(),
  height: z.number().int().nullable(),
  /** The name to show and to save as: the uploaded name made safe, with the extension of what the file really is. */
  name: z.string(),
  uploadedBy: IdSchema.nullable(),
  uploaderName: z.string().nullable(),
  createdAt: z.string(),
  url: z.string(),
  /** A small WebP preview; null for documents and photos the server could not read. */
  thumbUrl: z.string().nullable(),
});
export type Attachment = z.infer<typeof AttachmentSchema>;

export const AttachmentListSchema = z.object({ items: z.array(AttachmentSchema) });
export const AttachmentResultSchema = z.object({ attachment: AttachmentSchema });
