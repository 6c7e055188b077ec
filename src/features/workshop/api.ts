import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../lib/api-client';
import {
  BayAnswerSchema, CapacitySchema, HoursAnswerSchema, TimeOffAnswerSchema, WorkPatternAnswerSchema,
  type BayPatch, type DayHours, type TimeOffCreate, type WorkPatternCreate, type WorkPatternPatch,
} from '../../../shared/schemas/capacity';

export const workshopQueries = {
  all: () => ['capacity'] as const,
  capacity: () => queryOptions({ queryKey: [...workshopQueries.all(), 'sites'], queryFn: () => api.get('/api/capacity', CapacitySchema) }),
};

/** A write to the workshop's capacity: on success the capacity is read again (and the plan with it). */
function useCapacityWrite<T>(fn: (input: T) => Promise<unknown>) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: fn,
    onSuccess: async () => {
      await qc.invalidateQueries({ queryKey: workshopQueries.all() });
      await qc.invalidateQueries({ queryKey: ['plan'] });
      await qc.invalidateQueries({ queryKey: ['sites'] });
    },
  });
}

export const useSaveHours = () => useCapacityWrite((v: { siteId: string; hours: DayHours[] }) => api.put(`/api/sites/${v.siteId}/hours`, { hours: v.hours }, HoursAnswerSchema));
export const useAddBay = () => useCapacityWrite((v: { siteId: string; name?: string }) => api.post(`/api/sites/${v.siteId}/bays`, v.name ? { name: v.name } : {}, BayAnswerSchema));
export const usePatchBay = () => useCapacityWrite((v: { id: string } & BayPatch) => api.patch(`/api/bays/${v.id}`, { name: v.name, position: v.position }, BayAnswerSchema));
export const useRemoveBay = () => useCapacityWrite((id: string) => api.delete(`/api/bays/${id}`));
export const useAddPattern = () => useCapacityWrite((v: WorkPatternCreate) => api.post('/api/work-patterns', v, WorkPatternAnswerSchema));
export const usePatchPattern = () => useCapacityWrite((v: { id: string } & WorkPatternPatch) => {
  const { id, ...patch } = v;
  return api.patch(`/api/work-patterns/${id}`, patch, WorkPatternAnswerSchema);
});
export const useRemovePattern = () => useCapacityWrite((id: string) => api.delete(`/api/work-patterns/${id}`));
export const useAddTimeOff = () => useCapacityWrite((v: TimeOffCreate) => api.post('/api/time-off', v, TimeOffAnswerSchema));
export const useRemoveTimeOff = () => useCapacityWrite((id: string) => api.delete(`/api/time-off/${id}`));
