import type { JobDeps, JobResult } from './types';
import { syncAllFeeds } from '../server/services/booking-feeds';

/**
 * Loads every calendar feed: a good copy replaces the feed's bookings, a failed one keeps the last good
 * copy and records the error. Safe to run twice or at once: each load replaces the feed's rows whole.
 */
export async function run(deps: JobDeps): Promise<JobResult> {
  const results = await syncAllFeeds(deps.db, deps.now());
  const failed = results.filter((r) => !r.ok);
  const events = results.reduce((n, r) => n + (r.ok ? r.events : 0), 0);
  const skipped = results.reduce((n, r) => n + r.skipped, 0);
  for (const f of failed) deps.log(`[booking-sync] ${f.name}: ${f.error}`);
  return {
    summary: results.length
      ? `Loaded ${results.length - failed.length} of ${results.length} calendar feeds: ${events} events${skipped ? `, ${skipped} skipped (no bike or model named)` : ''}${failed.length ? `; could not load ${failed.map((f) => `${f.name} (${f.error})`).join(', ')}` : ''}.`
      : 'No calendar feeds to load.',
    feeds: results.length,
    failed: failed.length,
    events,
    skipped,
  };
}
