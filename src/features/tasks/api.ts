import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../lib/api-client';
import { TaskListSchema, TaskSchema, type TaskListQuery } from '../../../shared/schemas/tasks';
import { MyDaySchema } from '../../../shared/schemas/plan';

export const taskQueries = {
  all: () => ['tasks'] as const,
  list: (f: Pick<TaskListQuery, 'mine' | 'status'>) =>
    queryOptions({ queryKey: [...taskQueries.all(), 'list', f], queryFn: () => api.get('/api/tasks', TaskListSchema, f) }),
  // Under the plan's key: a move or a re-plan on the board refreshes the technician's day.
  myDay: () => queryOptions({ queryKey: ['plan', 'my-day'], queryFn: () => api.get('/api/plan/my-day', MyDaySchema) }),
};

const TaskResult = z.object({ task: TaskSchema });

function useTaskMutation<V>(fn: (v: V) => Promise<unknown>) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: fn,
    // Starting and signing off move the bike in and out of the workshop and restart its dues.
    // A refusal leaves the list as it is, so the card stays to say why; its Reload button refetches.
    onSuccess: () => {
      void qc.invalidateQueries({ queryKey: taskQueries.all() });
      void qc.invalidateQueries({ queryKey: ['bikes'] });
      void qc.invalidateQueries({ queryKey: ['due'] });
    },
  });
}

export const useStartTask = () => useTaskMutation((id: string) => api.post(`/api/tasks/${id}/start`, {}, TaskResult));

