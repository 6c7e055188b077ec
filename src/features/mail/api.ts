import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../lib/api-client';

// The admin mail routes have no shared schema yet; these mirror server/routes/admin-mail.ts.
const CaughtSchema = z.object({ id: z.string(), to: z.string(), from: z.string(), subject: z.string(), receivedAt: z.string() });
export type CaughtMail = z.infer<typeof CaughtSchema>;
const MessageSchema = z.object({ message: CaughtSchema.extend({ text: z.string(), html: z.string().nullable() }) });
export type MailMessage = z.infer<typeof MessageSchema>['message'];
export const OUTBOX_STATUSES = ['pending', 'sent', 'failed'] as const;
const OutboxSchema = z.object({
  items: z.array(
    z.object({
      id: z.string(),
      to: z.string(),
      subject: z.string(),
      status: z.enum(OUTBOX_STATUSES),
      attempts: z.number(),
      lastError: z.string().nullable(),
      nextAttemptAt: z.string(),
      sentAt: z.string().nullable(),
    }),
  ),
});
export type OutboxItem = z.infer<typeof OutboxSchema>['items'][number];
const JobRunSchema = z.object({ job: z.string(), result: z.looseObject({ summary: z.string() }) });

export const JOBS = [
  { name: 'due-scan', label: 'Scan for due work', what: 'Recomputes every bike’s dues, raises tasks and grounds bikes with overdue safety work.' },
  { name: 'weekly-digest', label: 'Send the weekly due list', what: 'Queues the Monday e-mail to each manager and sends it.' },
  { name: 'deliver-mail', label: 'Send waiting mail', what: 'Tries every message in the outbox that is due for a new attempt.' },
  { name: 'booking-sync', label: 'Load booking calendars', what: 'Loads every calendar feed of hires and lessons; a feed that fails keeps its last good copy.' },
] as const;
export type JobName = (typeof JOBS)[number]['name'];

export const mailQueries = {
  all: () => ['mail'] as const,
  list: () => queryOptions({ queryKey: [...mailQueries.all(), 'list'], queryFn: () => api.get('/api/admin/mail', z.object({ items: z.array(CaughtSchema) })) }),
  message: (id: string) => queryOptions({ queryKey: [...mailQueries.all(), 'message', id], queryFn: () => api.get(`/api/admin/mail/${id}`, MessageSchema), staleTime: Infinity }),
  outbox: () => queryOptions({ queryKey: [...mailQueries.all(), 'outbox'], queryFn: () => api.get('/api/admin/mail/outbox', OutboxSchema) }),
};

export function useRunJob() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (name: JobName) => api.post(`/api/admin/jobs/${name}/run`, {}, JobRunSchema),
    onSuccess: () => {
      // Jobs send mail and change dues, tasks and bike states.
      void qc.invalidateQueries({ queryKey: mailQueries.all() });
      for (const key of ['due', 'tasks', 'bikes']) void qc.invalidateQueries({ queryKey: [key] });
    },
  });
}
