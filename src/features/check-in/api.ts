import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { api } from '../../lib/api-client';
import { BikeDetailSchema, BikeListSchema, CheckInResultSchema } from '../../../shared/schemas/bikes';
import type { CheckIn } from '../../../shared/schemas/due';
import { NextVisitsSchema } from '../../../shared/schemas/plan';

// The same keys as the fleet screens use, so a bike fetched on one is fresh on the other.
export const checkInQueries = {
  bikes: () => queryOptions({ queryKey: ['bikes', 'list', {}], queryFn: () => api.get('/api/bikes', BikeListSchema, {}) }),
  bike: (id: string) => queryOptions({ queryKey: ['bikes', 'detail', id], queryFn: () => api.get(`/api/bikes/${id}`, BikeDetailSchema) }),
  // Under the plan's key, so a move on the plan board is seen here too.
  nextVisits: (site: string) => queryOptions({ queryKey: ['plan', 'next-visits', site], queryFn: () => api.get('/api/plan/next-visits', NextVisitsSchema, { site }) }),
};

export type CheckInResult = z.infer<typeof CheckInResultSchema>;

export function useCheckIn(bikeId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: CheckIn) => api.post(`/api/bikes/${bikeId}/check-ins`, body, CheckInResultSchema),
    onSuccess: () => {
      // A reading moves the bike's dues and perhaps its state: every list that shows them.
      void qc.invalidateQueries({ queryKey: ['bikes'] });
      void qc.invalidateQueries({ queryKey: ['due'] });
      void qc.invalidateQueries({ queryKey: ['tasks'] });
    },
  });
}
