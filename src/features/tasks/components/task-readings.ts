import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client';
import { ReadingTemplateSchema, TaskSchema, type CloseTask } from '../../../../shared/schemas/tasks';
import { taskQueries } from '../api';
import { TaskPartSchema } from '../../../../shared/schemas/parts';

const TaskDetailSchema = z.object({ task: TaskSchema, readings: z.array(ReadingTemplateSchema), parts: z.array(TaskPartSchema).default([]) });
const ClosedSchema = z.object({ task: TaskSchema, grounded: z.boolean() });

/** The task with the readings its service item asks for at sign-off, and the parts it usually takes. */
export const taskDetailQuery = (id: string) =>
  queryOptions({ queryKey: [...taskQueries.all(), 'detail', id], queryFn: () => api.get(`/api/tasks/${id}`, TaskDetailSchema) });

/** Signing off with readings; the answer says whether a reading took the bike out of service. */
export function useSignOff() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, ...body }: CloseTask & { id: string }) => api.post(`/api/tasks/${id}/close`, body, ClosedSchema),
    // Signing off restarts the item's dues and may ground the bike: every list that shows either moves.
    onSuccess: () => {
      void qc.invalidateQueries({ queryKey: taskQueries.all() });
      void qc.invalidateQueries({ queryKey: ['bikes'] });
      void qc.invalidateQueries({ queryKey: ['due'] });
      // What it used came off the shelf.
      void qc.invalidateQueries({ queryKey: ['parts'] });
    },
  });
}
