import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../lib/api-client';
import { ShimStockLineSchema, type StockAdjustSchema, type StockMinSchema } from '../../../shared/schemas/valves';

export const StockListSchema = z.object({ items: z.array(ShimStockLineSchema) });
// The reorder list has no shared schema yet; this mirrors what the server sends.
export const ReorderListSchema = z.object({ items: z.array(z.object({ sizeMm: z.number(), need: z.number(), reasons: z.array(z.string()) })) });
export type ReorderLine = z.infer<typeof ReorderListSchema>['items'][number];
export type StockAdjust = z.infer<typeof StockAdjustSchema>;
export type StockMin = z.infer<typeof StockMinSchema>;

export const stockQueries = {
  all: () => ['stock'] as const,
  shims: (siteId: string) =>
    queryOptions({ queryKey: [...stockQueries.all(), 'shims', siteId], queryFn: () => api.get('/api/stock/shims', StockListSchema, { siteId }), enabled: !!siteId }),
  reorder: (siteId: string) =>
    queryOptions({ queryKey: [...stockQueries.all(), 'reorder', siteId], queryFn: () => api.get('/api/stock/shims/reorder', ReorderListSchema, { siteId }), enabled: !!siteId }),
};

/** The server answers with the site's new stock: show it at once, then refresh what depends on it. */
function useStockChange<V extends { siteId: string }>(fn: (v: V) => Promise<z.infer<typeof StockListSchema>>) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: fn,
    onSuccess: (data, v) => {
      qc.setQueryData(stockQueries.shims(v.siteId).queryKey, data);
      void qc.invalidateQueries({ queryKey: stockQueries.reorder(v.siteId).queryKey });
      // Open valve cards plan their shims from this stock.
      void qc.invalidateQueries({ queryKey: ['valves', 'card'] });
    },
  });
}

export const useAdjustStock = () => useStockChange((b: StockAdjust) => api.post('/api/stock/shims/adjust', b, StockListSchema));

export const useSetMinimum = () =>
  useStockChange(async (b: StockMin) => api.put('/api/stock/shims/minimum', b, StockListSchema));
