import { z } from 'zod';

/** A CSV file sent for checking or importing; a few years of a large fleet's readings fit well within it. */
export const IMPORT_MAX_BYTES = 5 * 1024 * 1024;
/** A backup file sent for restoring: the database and every photo and document. It waits on disk while it is checked. */
export const RESTORE_MAX_BYTES = 20 * 1024 * 1024 * 1024;

export const IMPORT_KINDS = ['bikes', 'readings'] as const;
export type ImportKind = (typeof IMPORT_KINDS)[number];
export const ImportParamsSchema = z.object({ kind: z.enum(IMPORT_KINDS, { message: 'Import bikes or readings.' }) });

export const ImportBodySchema = z.object({
  csv: z
    .string({ message: 'Send the CSV file’s text.' })
    .min(1, 'The file is empty.')
    .max(IMPORT_MAX_BYTES, `The file is larger than ${IMPORT_MAX_BYTES / 1024 / 1024} MB. Split it into smaller files.`),
});
export type ImportBody = z.infer<typeof ImportBodySchema>;

export const RowErrorSchema = z.object({ field: z.string(), message: z.string() });
export const PreviewRowSchema = z.object({
  line: z.number(),
  ok: z.boolean(),
  errors: z.array(RowErrorSchema),
  data: z.record(z.string(), z.string()),
});
export type PreviewRow = z.infer<typeof PreviewRowSchema>;
export const ImportPreviewSchema = z.object({ rows: z.array(PreviewRowSchema), valid: z.number(), invalid: z.number() });
export type ImportPreview = z.infer<typeof ImportPreviewSchema>;

export const ImportReportSchema = z.object({
  imported: z.number(),
  skipped: z.array(z.object({ line: z.number(), errors: z.array(RowErrorSchema) })),
  /** How many bikes were added or had readings added (their due items were recomputed). */
  bikes: z.number(),
});
export type ImportReport = z.infer<typeof ImportReportSchema>;

export const BackupFormatSchema = z.object({ format: z.enum(['data-dir', 'json']).optional() });

export const RestoreFilesSchema = z.object({
  /** Whether the backup held the stored files; older backups hold the database only. */
  included: z.boolean(),
  /** Files the restored records name: photos, their previews and documents. */
  named: z.number(),
  /** Files put back from the backup, and their bytes. */
  restored: z.number(),
  bytes: z.number(),
  /** Of those, how many the store already held with the same bytes. */
  alreadyStored: z.number(),
  /** Named by the restored records but in neither the backup nor the store. */
  missing: z.number(),
  /** Named only by the records the restore replaced: removed from the store. */
  removed: z.number(),
});
export type RestoreFiles = z.infer<typeof RestoreFilesSchema>;

export const RestoreReportSchema = z.object({
  /** How the database was held: its data directory, or the portable JSON dump. */
  format: z.enum(['data-dir', 'json']),
  /** Rows now in each table, in the order they were restored. */
  tables: z.array(z.object({ name: z.string(), rows: z.number() })),
  files: RestoreFilesSchema,
  /** Sessions are not restored: everyone, the person restoring included, signs in again. */
  signedOut: z.literal(true),
});
export type RestoreReport = z.infer<typeof RestoreReportSchema>;
