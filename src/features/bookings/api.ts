import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../lib/api-client';
import { BikeListSchema } from '../../../shared/schemas/bikes';
import {
  BookingImportReportSchema, BookingListSchema, BookingSchema, FeedCreatedSchema, FeedListSchema, type BookingCreateInput, type FeedCreateInput,
} from '../../../shared/schemas/bookings';
import { ImportPreviewSchema } from '../../../shared/schemas/imports';

export interface BookingFilter {
  site?: string;
  from: string;
  to: string;
}

export const bookingQueries = {
  all: () => ['bookings'] as const,
  list: (f: BookingFilter) => queryOptions({ queryKey: [...bookingQueries.all(), 'list', f], queryFn: () => api.get('/api/bookings', BookingListSchema, { ...f }) }),
  feeds: () => queryOptions({ queryKey: [...bookingQueries.all(), 'feeds'], queryFn: () => api.get('/api/booking-feeds', FeedListSchema) }),
  bikes: (siteId: string) => queryOptions({ queryKey: ['bikes', 'list', { siteId }], queryFn: () => api.get('/api/bikes', BikeListSchema, { siteId }), enabled: !!siteId }),
};

function useInvalidate() {
  const qc = useQueryClient();
  return () => {
    void qc.invalidateQueries({ queryKey: bookingQueries.all() });
    // The plan keeps bikes out of the workshop while they are booked.
    void qc.invalidateQueries({ queryKey: ['plan'] });
  };
}

export function useCreateBooking() {
  const done = useInvalidate();
  return useMutation({ mutationFn: (b: BookingCreateInput) => api.post('/api/bookings', b, BookingSchema), onSuccess: done });
}

export function useDeleteBooking() {
  const done = useInvalidate();
  return useMutation({ mutationFn: (id: string) => api.delete(`/api/bookings/${id}`), onSuccess: done });
}

export function usePreviewBookings() {
  return useMutation({ mutationFn: (csv: string) => api.post('/api/bookings/import/preview', { csv }, ImportPreviewSchema) });
}

export function useImportBookings() {
  const done = useInvalidate();
  return useMutation({ mutationFn: (csv: string) => api.post('/api/bookings/import', { csv }, BookingImportReportSchema), onSuccess: done });
}

export function useCreateFeed() {
  const done = useInvalidate();
  return useMutation({ mutationFn: (f: FeedCreateInput) => api.post('/api/booking-feeds', f, FeedCreatedSchema), onSuccess: done });
}

export function useDeleteFeed() {
  const done = useInvalidate();
  return useMutation({ mutationFn: (id: string) => api.delete(`/api/booking-feeds/${id}`), onSuccess: done });
}
