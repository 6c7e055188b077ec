import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../lib/api-client';
import { AttachmentListSchema, AttachmentResultSchema, type AttachmentListQuery } from '../../../shared/schemas/attachments';

export const photoQueries = {
  all: () => ['photos'] as const,
  bike: (bikeId: string) => [...photoQueries.all(), 'bike', bikeId] as const,
  /** A bike's photos and documents, optionally only those of one defect or task. */
  list: (bikeId: string, f: AttachmentListQuery = {}) =>
    queryOptions({
      queryKey: [...photoQueries.bike(bikeId), f],
      queryFn: () => api.get(`/api/bikes/${bikeId}/attachments`, AttachmentListSchema, f),
    }),
};

export interface PhotoUpload {
  file: File;
  defectId?: string;
  taskId?: string;
}

export function useUploadPhoto(bikeId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ file, defectId, taskId }: PhotoUpload) => {
      const form = new FormData();
      if (defectId) form.set('defectId', defectId);
      if (taskId) form.set('taskId', taskId);
      form.set('file', file, file.name);
      return api.post(`/api/bikes/${bikeId}/attachments`, form, AttachmentResultSchema);
    },
    onSuccess: () => qc.invalidateQueries({ queryKey: photoQueries.bike(bikeId) }),
  });
}

export function useRemovePhoto(bikeId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (attachmentId: string) => api.delete(`/api/attachments/${attachmentId}`),
    onSuccess: () => qc.invalidateQueries({ queryKey: photoQueries.bike(bikeId) }),
  });
}
