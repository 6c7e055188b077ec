import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiPut } from '../../lib/api-put';
import { settingsQueries, SettingsResultSchema, type SettingsForm } from '../../lib/settings-queries';

export function useSaveSettings() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (s: SettingsForm) => apiPut('/api/admin/settings', s, SettingsResultSchema),
    onSuccess: (d) => qc.setQueryData(settingsQueries.current().queryKey, d),
  });
}
