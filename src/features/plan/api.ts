import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../lib/api-client';
import { PlanAnswerSchema, PlanVisitSchema, type VisitMove } from '../../../shared/schemas/plan';

export interface BoardRange {
  site: string;
  from: string;
  to: string;
}

export const planQueries = {
  // My tasks and check-in read the plan under this key too, so a move or a re-plan refreshes them.
  all: () => ['plan'] as const,
  board: (r: BoardRange) => queryOptions({ queryKey: [...planQueries.all(), 'board', r], queryFn: () => api.get('/api/plan', PlanAnswerSchema, { ...r }) }),
};

const MoveResult = z.object({ visit: PlanVisitSchema });

/** A refused move (409) leaves the cache alone: the board still shows where the visit stands. */
export function useMoveVisit() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, move }: { id: string; move: VisitMove }) => api.patch(`/api/plan/visits/${id}`, move, MoveResult),
    onSuccess: () => qc.invalidateQueries({ queryKey: planQueries.all() }),
  });
}

export function useReplan() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (site: string) => api.post('/api/plan/run', { site }, PlanAnswerSchema),
    onSuccess: () => qc.invalidateQueries({ queryKey: planQueries.all() }),
  });
}
