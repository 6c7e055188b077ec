import { queryOptions } from '@tanstack/react-query';
import { api } from './api-client';
import { ModelListSchema, SiteListSchema } from '../../shared/schemas/reference';

export const referenceQueries = {
  sites: () => queryOptions({ queryKey: ['sites'], queryFn: () => api.get('/api/sites', SiteListSchema), staleTime: 5 * 60_000 }),
  models: () => queryOptions({ queryKey: ['models'], queryFn: () => api.get('/api/models', ModelListSchema), staleTime: 5 * 60_000 }),
};
