import { z } from 'zod';
import { IdSchema } from './common';

/**
 * What every row of work shows about its bike and service item: a task on someone's list and an
 * item on the due list are both "this bike, this item, due then, given to them".
 */
export const WorkRowSchema = z.object({
  bikeId: IdSchema,
  fleetNumber: z.string(),
  siteId: IdSchema,
  siteName: z.string(),
  modelName: z.string(),
  itemId: IdSchema,
  item: z.string(),
  category: z.string(),
  safetyCritical: z.boolean(),
  dueDate: z.string().nullable(),
  bikeStatus: z.string(),
  assignee: z.object({ id: IdSchema, name: z.string() }).nullable(),
});
export type WorkRow = z.infer<typeof WorkRowSchema>;
