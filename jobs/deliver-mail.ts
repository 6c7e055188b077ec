import type { JobDeps, JobResult } from './types';
import { deliverOutbox } from '../server/mail/outbox';

/** Sends what waits in the outbox, retrying failed messages with back-off. */
export async function run(deps: JobDeps): Promise<JobResult> {
  const r = await deliverOutbox(deps.db, deps.mail.transport(), deps.mail.from, deps.now());
  return { summary: `Outbox: sent ${r.sent}, ${r.retrying} to retry, ${r.failed} failed.`, ...r };
}
