import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../lib/api-client';
import { BikeListSchema } from '../../../shared/schemas/bikes';
import { DueListSchema, type DUE_STATUSES } from '../../../shared/schemas/due';
import { AssigneeListSchema } from '../../../shared/schemas/tasks';

export interface DueFilter {
  within: number;
  siteId?: string;
  modelId?: string;
  status?: (typeof DUE_STATUSES)[number];
  item?: string;
}

const FeedSchema = z.object({ url: z.string() });

export const dueQueries = {
  all: () => ['due'] as const,
  list: (f: DueFilter) => queryOptions({ queryKey: [...dueQueries.all(), 'list', f], queryFn: () => api.get('/api/due', DueListSchema, { ...f }) }),
  // Only the grounded bikes: the board needs a handful, not the fleet register's thousands.
  grounded: () =>
    queryOptions({
      queryKey: ['bikes', 'list', { status: 'out_of_service' }],
      queryFn: () => api.get('/api/bikes', BikeListSchema, { status: 'out_of_service' }),
    }),
  assignees: () => queryOptions({ queryKey: ['tasks', 'assignees'], queryFn: () => api.get('/api/tasks/assignees', AssigneeListSchema) }),
  feed: () => queryOptions({ queryKey: ['calendar', 'feed'], queryFn: () => api.get('/api/calendar/feed', FeedSchema), staleTime: Infinity }),
};

/** The CSV of the same list, for a spreadsheet: the server streams it with the filters on screen. */
export function csvHref(f: DueFilter) {
  const p = new URLSearchParams();
  for (const [k, v] of Object.entries(f)) if (v !== undefined && v !== '') p.set(k, String(v));
  return `/api/due.csv?${p.toString()}`;
}

export function useAssign() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ taskId, assigneeId }: { taskId: string; assigneeId: string | null }) => api.post(`/api/tasks/${taskId}/assign`, { assigneeId }),
    onSuccess: () => {
      void qc.invalidateQueries({ queryKey: dueQueries.all() });
      void qc.invalidateQueries({ queryKey: ['tasks'] });
    },
  });
}

export function useResetFeed() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: () => api.post('/api/calendar/feed/reset', {}, FeedSchema),
    onSuccess: (r) => qc.setQueryData(dueQueries.feed().queryKey, r),
  });
}
