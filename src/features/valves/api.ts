import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../lib/api-client';
import { writeOrQueue } from '../../lib/offline/queue';
import { BikeDetailSchema } from '../../../shared/schemas/bikes';
import { TaskSchema } from '../../../shared/schemas/tasks';
import { BikeValvesSchema, RollupSchema, ValveCardSchema, type CloseValveTask } from '../../../shared/schemas/valves';
import { IdSchema } from '../../../shared/schemas/common';

// The warnings list has no shared schema yet; this mirrors what the server sends.
export const ValveWarningListSchema = z.object({
  items: z.array(z.object({ bikeId: IdSchema, fleetNumber: z.string(), valve: z.string(), message: z.string(), kmAtSpecMin: z.number().nullable() })),
});
export type ValveWarning = z.infer<typeof ValveWarningListSchema>['items'][number];

export const valveQueries = {
  all: () => ['valves'] as const,
  card: (taskId: string) =>
    queryOptions({ queryKey: [...valveQueries.all(), 'card', taskId], queryFn: () => api.get(`/api/tasks/${taskId}/valve-card`, ValveCardSchema) }),
  bike: (bikeId: string) =>
    queryOptions({ queryKey: [...valveQueries.all(), 'bike', bikeId], queryFn: () => api.get(`/api/bikes/${bikeId}/valves`, BikeValvesSchema) }),
  rollup: () => queryOptions({ queryKey: [...valveQueries.all(), 'rollup'], queryFn: () => api.get('/api/valves/rollup', RollupSchema) }),
  warnings: () => queryOptions({ queryKey: [...valveQueries.all(), 'warnings'], queryFn: () => api.get('/api/valves/warnings', ValveWarningListSchema) }),
  /** The bike as its own page loads it (same key), for the next due date after sign-off. */
  bikeDetail: (bikeId: string) =>
    queryOptions({ queryKey: ['bikes', 'detail', bikeId], queryFn: () => api.get(`/api/bikes/${bikeId}`, BikeDetailSchema) }),
};

const TaskResult = z.object({ task: TaskSchema });

/** Starting and signing off move the bike in and out of the workshop and restart its dues. */
function useInvalidateAfterTask() {
  const qc = useQueryClient();
  return () => {
    for (const key of [['tasks'], ['bikes'], ['due'], ['stock'], valveQueries.all()]) void qc.invalidateQueries({ queryKey: key });
  };
}

export function useStartValveTask(taskId: string) {
  const invalidate = useInvalidateAfterTask();
  return useMutation({ mutationFn: () => api.post(`/api/tasks/${taskId}/start`, {}, TaskResult), onSettled: invalidate });
}

/**
 * Signing off sends at once with a connection; without one the sign-off waits on the device (with
 * its key) and is sent when the connection is back, judged then by the server's rules.
 */
export function useCloseValveTask(task: { id: string; fleetNumber: string }, userId: string) {
  const invalidate = useInvalidateAfterTask();
  return useMutation({
    networkMode: 'always',
    mutationFn: (body: CloseValveTask) =>
      writeOrQueue(
        { userId, method: 'POST', url: `/api/tasks/${task.id}/valve-close`, body, label: `Valve check sign-off of ${task.fleetNumber}`, href: `/tasks/${task.id}/valves` },
        (d) => TaskResult.parse(d),
      ),
    onSuccess: (r) => {
      if (!r.queued) invalidate();
    },
  });
}

export interface ServerDraft {
  readings: Record<string, unknown>[];
  savedAt: string;
}

export const saveValveDraft = (taskId: string, draft: ServerDraft, keepalive = false) =>
  api.put(`/api/tasks/${taskId}/draft`, draft, undefined, { keepalive });
