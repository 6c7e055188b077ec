import { api } from '../../lib/api-client';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { settingsQueries, SettingsResultSchema, type SettingsForm } from '../../lib/settings-queries';

export function useSaveSettings() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (s: SettingsForm) => api.put('/api/admin/settings', s, SettingsResultSchema),
    onSuccess: (d) => qc.setQueryData(settingsQueries.current().queryKey, d),
  });
}
