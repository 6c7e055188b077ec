import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../lib/api-client';
import {
  BikeDetailSchema,
  BikeListSchema,
  BikeSummarySchema,
  type BikeCreate,
  type BikeListQuery,
  type BikeStatusChange,
} from '../../../shared/schemas/bikes';

export const bikeQueries = {
  all: () => ['bikes'] as const,
  list: (f: BikeListQuery = {}) => queryOptions({ queryKey: [...bikeQueries.all(), 'list', f], queryFn: () => api.get('/api/bikes', BikeListSchema, f) }),
  detail: (id: string) => queryOptions({ queryKey: [...bikeQueries.all(), 'detail', id], queryFn: () => api.get(`/api/bikes/${id}`, BikeDetailSchema) }),
};

const BikeResult = z.object({ bike: BikeSummarySchema });

export function useCreateBike() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (b: BikeCreate) => api.post('/api/bikes', b, BikeResult),
    onSuccess: () => qc.invalidateQueries({ queryKey: [...bikeQueries.all(), 'list'] }),
  });
}

export function useChangeStatus(id: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (b: BikeStatusChange) => api.post(`/api/bikes/${id}/status`, b, BikeResult),
    onSuccess: () => qc.invalidateQueries({ queryKey: bikeQueries.all() }),
  });
}
