import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../lib/api-client';
import {
  ForecastSchema, PartListSchema, PurchaseOrderListSchema, PurchaseOrderSchema, ShortageListSchema, StockViewSchema,
  type PurchaseOrderCreate, type PurchaseOrderReceive, type StockMovementCreate, type StockView,
} from '../../../shared/schemas/parts';

export const FORECAST_WEEKS = 8;

export const partQueries = {
  all: () => ['parts'] as const,
  catalogue: () => queryOptions({ queryKey: [...partQueries.all(), 'catalogue'], queryFn: () => api.get('/api/parts', PartListSchema), staleTime: 5 * 60_000 }),
  stock: (siteId: string) =>
    queryOptions({ queryKey: [...partQueries.all(), 'stock', siteId], queryFn: () => api.get('/api/stock', StockViewSchema, { site: siteId }), enabled: !!siteId }),
  forecast: (siteId: string) =>
    queryOptions({
      queryKey: [...partQueries.all(), 'forecast', siteId],
      queryFn: () => api.get('/api/forecast', ForecastSchema, { site: siteId, weeks: FORECAST_WEEKS }),
      enabled: !!siteId,
    }),
  /** Across the signed-in person's sites: what runs out before an order placed today could arrive. */
  shortages: () => queryOptions({ queryKey: [...partQueries.all(), 'shortages'], queryFn: () => api.get('/api/stock/shortages', ShortageListSchema) }),
  orders: (siteId: string) =>
    queryOptions({ queryKey: [...partQueries.all(), 'orders', siteId], queryFn: () => api.get('/api/purchase-orders', PurchaseOrderListSchema, { site: siteId }), enabled: !!siteId }),
};

// The order answers have no shared schema of their own; these mirror what the server sends.
const OrderAnswerSchema = z.object({ order: PurchaseOrderSchema });

export interface MinimumChange {
  siteId: string;
  partId: string;
  minimum: number;
}

/** Stock, on order and what the forecast suggests all move together: refresh the site's three answers. */
function useSiteRefresh() {
  const qc = useQueryClient();
  return (siteId: string) => {
    for (const q of [partQueries.stock(siteId), partQueries.forecast(siteId), partQueries.orders(siteId)]) void qc.invalidateQueries({ queryKey: q.queryKey });
  };
}

/** The server answers with the site's new stock: show it at once, then refresh the forecast that reads it. */
function useStockChange<V extends { siteId: string; otherSiteId?: string }>(fn: (v: V) => Promise<StockView>) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: fn,
    onSuccess: (data, v) => {
      qc.setQueryData(partQueries.stock(v.siteId).queryKey, data);
      void qc.invalidateQueries({ queryKey: partQueries.forecast(v.siteId).queryKey });
      // A transfer lands on the other site's shelf too.
      if (v.otherSiteId) {
        void qc.invalidateQueries({ queryKey: partQueries.stock(v.otherSiteId).queryKey });
        void qc.invalidateQueries({ queryKey: partQueries.forecast(v.otherSiteId).queryKey });
      }
    },
  });
}

export const useBookMovement = () => useStockChange((b: StockMovementCreate) => api.post('/api/stock/movements', b, StockViewSchema));

export const useSetPartMinimum = () => useStockChange((b: MinimumChange) => api.put('/api/stock/minimum', b, StockViewSchema));

export function useDraftFromForecast() {
  const refresh = useSiteRefresh();
  return useMutation({
    mutationFn: (siteId: string) => api.post('/api/purchase-orders/draft-from-forecast', { siteId }, PurchaseOrderListSchema),
    onSuccess: (_d, siteId) => refresh(siteId),
  });
}

export function useCreateOrder() {
  const refresh = useSiteRefresh();
  return useMutation({ mutationFn: (b: PurchaseOrderCreate) => api.post('/api/purchase-orders', b, OrderAnswerSchema), onSuccess: (_d, b) => refresh(b.siteId) });
}

interface OrderAction {
  siteId: string;
  id: string;
}

export function useOrderAction(action: 'send' | 'cancel') {
  const refresh = useSiteRefresh();
  return useMutation({ mutationFn: ({ id }: OrderAction) => api.post(`/api/purchase-orders/${id}/${action}`, {}, OrderAnswerSchema), onSuccess: (_d, v) => refresh(v.siteId) });
}

/** Books what arrived into stock: the shelf, what is on order and the forecast all change. */
export function useReceiveOrder() {
  const refresh = useSiteRefresh();
  return useMutation({
    mutationFn: ({ id, receipt }: OrderAction & { receipt: PurchaseOrderReceive }) => api.post(`/api/purchase-orders/${id}/receive`, receipt, OrderAnswerSchema),
    onSuccess: (_d, v) => refresh(v.siteId),
  });
}
