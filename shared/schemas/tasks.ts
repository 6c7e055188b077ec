import { z } from 'zod';
import { IdSchema, IsoDateSchema, MAX_TEXT } from './common';
import { WorkRowSchema } from './work-row';
import { PartsUsedSchema } from './parts';

export const TASK_STATUSES = ['open', 'in_progress', 'done', 'cancelled'] as const;
export const TASK_STATUS_LABELS: Record<(typeof TASK_STATUSES)[number], string> = {
  open: 'To do',
  in_progress: 'On the bench',
  done: 'Signed off',
  cancelled: 'Withdrawn',
};

export const TaskSchema = WorkRowSchema.extend({
  id: IdSchema,
  status: z.enum(TASK_STATUSES),
  origin: z.string(),
  estimatedMinutes: z.number(),
  raisedAt: z.string(),
  startedAt: z.string().nullable(),
  closedAt: z.string().nullable(),
  version: z.number(),
});
export type Task = z.infer<typeof TaskSchema>;
export const TaskListSchema = z.object({ items: z.array(TaskSchema) });

export const TaskListQuerySchema = z.object({
  mine: z.enum(['1', '0']).optional(),
  status: z.enum(['active', ...TASK_STATUSES]).default('active'),
  siteId: IdSchema.optional(),
  bikeId: IdSchema.optional(),
});
export type TaskListQuery = z.infer<typeof TaskListQuerySchema>;

export const AssignSchema = z.object({ assigneeId: IdSchema.nullable() });

export const ReadingValueSchema = z.object({
  templateId: IdSchema,
  value: z.number().min(-1000).max(100_000).nullable().optional(),
  done: z.boolean().nullable().optional(),
  dateValue: IsoDateSchema.nullable().optional(),
});
export type ReadingValue = z.infer<typeof ReadingValueSchema>;

export const CloseTaskSchema = z.object({
  /** The version the closer saw: a task changed meanwhile is not closed twice. */
  version: z.number().int().positive(),
  date: IsoDateSchema.optional(),
  notes: z.string().trim().max(MAX_TEXT).optional(),
  /** One value per reading the service item asks for. */
  readings: z.array(ReadingValueSchema).max(40).default([]),
  /** Parts taken from the site's shelf for this service; booked as used in the same transaction. */
  parts: PartsUsedSchema.optional(),
});

export const ReadingTemplateSchema = z.object({
  id: IdSchema,
  label: z.string(),
  kind: z.enum(['measure', 'check', 'date']),
  unit: z.string().nullable(),
  min: z.number().nullable(),
  max: z.number().nullable(),
  safetyCritical: z.boolean(),
});
export type ReadingTemplate = z.infer<typeof ReadingTemplateSchema>;
export type CloseTask = z.infer<typeof CloseTaskSchema>;

export const AssigneeListSchema = z.object({ items: z.array(z.object({ id: IdSchema, name: z.string(), siteIds: z.array(IdSchema), openMinutes: z.number() })) });
