import { queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from './api-client';

// The same limits the server checks (server/routes/settings.ts), so the form can say what is wrong before sending.
export const SettingsFormSchema = z.object({
  tyreTreadMinMm: z.number({ error: 'Type the depth in mm, e.g. 1.' }).min(0.5, 'Use at least 0.5 mm.').max(5, 'Use at most 5 mm.'),
});
export type SettingsForm = z.infer<typeof SettingsFormSchema>;

export const SettingsResultSchema = z.object({
  settings: z.object({ tyreTreadMinMm: z.number() }),
  sources: z.object({ tyreTreadMinMm: z.string() }),
});
export type SettingsResult = z.infer<typeof SettingsResultSchema>;

/** Site-wide limits the screens propose as defaults (read by every role; changed by an administrator). */
export const settingsQueries = {
  all: () => ['settings'] as const,
  current: () => queryOptions({ queryKey: settingsQueries.all(), queryFn: () => api.get('/api/settings', SettingsResultSchema), staleTime: 5 * 60_000 }),
};
