import { queryOptions } from '@tanstack/react-query';
import { api } from '../../lib/api-client';
import { ServiceRecordSchema } from '../../../shared/schemas/service-record';

export const recordQueries = {
  all: () => ['bikes', 'record'] as const,
  detail: (id: string) => queryOptions({ queryKey: [...recordQueries.all(), id], queryFn: () => api.get(`/api/bikes/${id}/service-record`, ServiceRecordSchema) }),
};

export const historyCsvHref = (id: string) => `/api/bikes/${id}/history.csv`;
