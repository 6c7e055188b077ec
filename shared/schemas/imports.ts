import { z } from 'zod';

/** A CSV file sent for checking or importing; a few years of a large fleet's readings fit well within it. */
export const IMPORT_MAX_BYTES = 5 * 1024 * 1024;
/** A backup file sent for restoring. */
export const RESTORE_MAX_BYTES = 200 * 1024 * 1024;

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

export const RestoreReportSchema = z.object({
  format: z.enum(['data-dir', 'json']),
  /** Rows now in each table, in the order they were restored. */
  tables: z.array(z.object({ name: z.string(), rows: z.number() })),
  /** Sessions are not restored: everyone, the person restoring included, signs in again. */
  signedOut: z.literal(true),
});
export type RestoreReport = z.infer<typeof RestoreReportSchema>;
