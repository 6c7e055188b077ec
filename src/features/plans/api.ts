import { queryOptions, useMutation, useQueryClient, type QueryClient } from '@tanstack/react-query';
import { api } from '../../lib/api-client';
import type { ModelUpsert, ServiceItemUpsert } from '../../../shared/schemas/plans';
import { ItemSavedSchema, ModelDetailSchema, ModelSavedSchema, type ModelDetail } from './schemas';

export const planQueries = {
  // The same root as the shared model list, so one invalidation refreshes both.
  all: () => ['models'] as const,
  detail: (id: string) => queryOptions({ queryKey: [...planQueries.all(), 'detail', id], queryFn: () => api.get(`/api/models/${id}`, ModelDetailSchema) }),
};

/** A plan change answers with the whole model; the bikes' dues, tasks and lists moved with it. */
function settle(qc: QueryClient, detail: ModelDetail) {
  qc.setQueryData(planQueries.detail(detail.model.id).queryKey, detail);
  void qc.invalidateQueries({ queryKey: planQueries.all() });
  void qc.invalidateQueries({ queryKey: ['bikes'] });
  void qc.invalidateQueries({ queryKey: ['due'] });
  void qc.invalidateQueries({ queryKey: ['tasks'] });
}

export function useCreateModel() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (m: ModelUpsert) => api.post('/api/models', m, ModelSavedSchema),
    onSuccess: (d) => settle(qc, d),
  });
}

export function useUpdateModel(id: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (m: ModelUpsert) => api.put(`/api/models/${id}`, m, ModelSavedSchema),
    onSuccess: (d) => settle(qc, d),
  });
}

export function useSaveItem(modelId: string, itemId: string | null) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (i: ServiceItemUpsert) =>
      itemId ? api.put(`/api/models/${modelId}/items/${itemId}`, i, ItemSavedSchema) : api.post(`/api/models/${modelId}/items`, i, ItemSavedSchema),
    onSuccess: (d) => settle(qc, d),
  });
}

export function useDeleteItem(modelId: string, itemId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: async () => ItemSavedSchema.parse(await api.delete(`/api/models/${modelId}/items/${itemId}`)),
    onSuccess: (d) => settle(qc, d),
  });
}
