import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { api } from '../../lib/api-client';
import { writeOrQueue, type WriteResult } from '../../lib/offline/queue';
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

export type CheckInOutcome = WriteResult<CheckInResult>;

/** The check-in's words in the device's queue, e.g. "Check-in of SM-07 at 12,480 km". */
export const checkInLabel = (fleetNumber: string, body: CheckIn) =>
  `Check-in of ${fleetNumber} at ${new Intl.NumberFormat('en-GB').format(body.odometer)}${body.defect ? ', with a defect' : ''}`;

/** Sent at once with a connection; without one it waits on the device and is sent when the connection is back. */
export function useCheckIn(bike: { id: string; fleetNumber: string }, userId: string) {
  const qc = useQueryClient();
  return useMutation({
    // Runs without a connection too: it then queues on the device instead of waiting paused.
    networkMode: 'always',
    mutationFn: (body: CheckIn): Promise<CheckInOutcome> =>
      writeOrQueue(
        { userId, method: 'POST', url: `/api/bikes/${bike.id}/check-ins`, body, label: checkInLabel(bike.fleetNumber, body), href: `/check-in?bike=${bike.id}` },
        (d) => CheckInResultSchema.parse(d),
      ),
    onSuccess: (r) => {
      if (r.queued) return;
      // A reading moves the bike's dues and perhaps its state: every list that shows them.
      void qc.invalidateQueries({ queryKey: ['bikes'] });
      void qc.invalidateQueries({ queryKey: ['due'] });
      void qc.invalidateQueries({ queryKey: ['tasks'] });
    },
  });
}
