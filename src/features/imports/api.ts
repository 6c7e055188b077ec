import { useMutation, useQueryClient } from '@tanstack/react-query';
import { setCsrfToken } from '../../lib/api-client';
import { ImportPreviewSchema, ImportReportSchema, RestoreReportSchema, type ImportKind } from '../../../shared/schemas/imports';
import { upload, type Progress } from './upload';

interface Send {
  kind: ImportKind;
  file: File;
  onProgress?: Progress;
}

// The file goes as text/csv: the API reads JSON bodies only up to 1 MB, a CSV file up to 5 MB.
export function usePreviewImport() {
  return useMutation({
    mutationFn: ({ kind, file, onProgress }: Send) => upload(`/api/import/${kind}/preview`, file, 'text/csv; charset=utf-8', ImportPreviewSchema, onProgress),
  });
}

export function useRunImport() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ kind, file, onProgress }: Send) => upload(`/api/import/${kind}`, file, 'text/csv; charset=utf-8', ImportReportSchema, onProgress),
    onSuccess: () => {
      void qc.invalidateQueries({ queryKey: ['bikes'] });
      void qc.invalidateQueries({ queryKey: ['due'] });
      void qc.invalidateQueries({ queryKey: ['tasks'] });
    },
  });
}

/** The download link: the browser saves the file the server names. */
export const backupHref = (format?: 'json') => `/api/admin/backup${format ? `?format=${format}` : ''}`;

export function useRestore() {
  return useMutation({
    mutationFn: ({ file, onProgress }: { file: File; onProgress?: Progress }) => upload('/api/admin/restore', file, 'application/octet-stream', RestoreReportSchema, onProgress),
    // Sessions are not restored: this one ended with the rest, and its token with it.
    onSuccess: () => setCsrfToken(null),
  });
}
