import { useEffect, useSyncExternalStore } from 'react';
import { Link } from 'react-router-dom';
import { useQueryClient, type QueryClient } from '@tanstack/react-query';
import { Button } from '../components/ui/button';
import { useOnline } from '../lib/offline/online';
import { dismiss, flush, loadQueue, resend, useQueue, waitingOf } from '../lib/offline/queue';
import type { SessionUser } from '../../shared/schemas/auth';

const RETRY_MS = 10_000;
const clock = (iso: string | number) => new Date(iso).toLocaleTimeString('en-GB', { hour: '2-digit', minute: '2-digit' });
const changes = (n: number) => `${n} ${n === 1 ? 'change' : 'changes'}`;

/** The oldest answer on screen: what an offline screen is "as of". */
function useShownAsOf(qc: QueryClient) {
  return useSyncExternalStore(
    (l) => qc.getQueryCache().subscribe(l),
    () => {
      let oldest = 0;
      for (const q of qc.getQueryCache().getAll()) {
        if (q.getObserversCount() === 0 || !q.state.dataUpdatedAt) continue;
        if (!oldest || q.state.dataUpdatedAt < oldest) oldest = q.state.dataUpdatedAt;
      }
      return oldest;
    },
  );
}

/** Sends the person's waiting changes on sign-in, when the connection comes back, and every 10 s while any wait. */
export function useQueueSender(user: SessionUser) {
  const qc = useQueryClient();
  const online = useOnline();
  const queue = useQueue();
  const waiting = waitingOf(queue, user.id).length;
  useEffect(() => {
    void loadQueue().then(() => flush(user.id, qc));
  }, [user.id, qc, online]);
  useEffect(() => {
    if (!waiting || !online) return;
    const t = setInterval(() => void flush(user.id, qc), RETRY_MS);
    return () => clearInterval(t);
  }, [waiting, online, user.id, qc]);
}

/**
 * A calm line under the header: offline and since when, the changes waiting on this device, the
 * last send, and any change the server refused, with what to do about it.
 */
export function OfflineBar({ user }: { user: SessionUser }) {
  const qc = useQueryClient();
  const online = useOnline();
  const queue = useQueue();
  const asOf = useShownAsOf(qc);
  useQueueSender(user);
  const waiting = waitingOf(queue, user.id);
  const refused = queue.changes.filter((c) => c.userId === user.id && c.state === 'refused');
  const others = queue.changes.filter((c) => c.userId !== user.id && c.state === 'waiting').length;
  if (online && !waiting.length && !refused.length && !others) return null;
  return (
    <div className="no-print border-b-2 border-ink-line bg-paper-sunk">
      <div className="mx-auto flex max-w-7xl flex-col gap-2 px-4 py-2">
        <p role="status" data-testid="offline-status" className="flex flex-wrap items-center gap-x-3 gap-y-1">
          {!online && (
            <span className="font-semibold">
              <span aria-hidden>◌ </span>Offline. {asOf ? `Showing what this device last loaded, as of ${clock(asOf)}.` : 'Nothing is loaded on this device yet.'}
            </span>
          )}
          {waiting.length > 0 && (
            <span data-testid="waiting-count">
              {changes(waiting.length)} {waiting.length === 1 ? 'waits' : 'wait'} on this device
              {queue.needsSignIn ? ' until you sign in again.' : online ? (queue.sending ? ': sending…' : ': sending shortly.') : ', sent when the connection is back.'}
            </span>
          )}
          {queue.lastSentAt && <span className="text-ink-soft">Last sent {clock(queue.lastSentAt)}.</span>}
          {others > 0 && <span className="text-ink-soft">{changes(others)} of another person wait here until they sign in.</span>}
        </p>
        {waiting.length > 0 && (
          <details>
            <summary className="min-h-tap cursor-pointer py-2">What is waiting</summary>
            <ol className="list-decimal pl-6">
              {waiting.map((c) => <li key={c.id}>{c.label} <span className="text-ink-soft">(made {clock(c.madeAt)})</span></li>)}
            </ol>
          </details>
        )}
        {refused.length > 0 && (
          <section aria-labelledby="refused-changes" className="rounded-card border-2 border-state-soon bg-state-soon-soft p-3">
            <h2 id="refused-changes" className="font-bold">
              <span aria-hidden>◔ </span>{refused.length === 1 ? 'One change came back' : `${refused.length} changes came back`}: the server did not accept {refused.length === 1 ? 'it' : 'them'}, and nothing of {refused.length === 1 ? 'it' : 'them'} was saved
            </h2>
            <ul className="mt-2 flex flex-col gap-2">
              {refused.map((c) => (
                <li key={c.id} className="flex flex-wrap items-center gap-3">
                  <span>
                    <strong>{c.label}</strong> (made {clock(c.madeAt)}): {c.problem}
                  </span>
                  {c.code === 'needs_confirmation' && (
                    <Button onClick={() => void resend(c.id, { ...(c.body as object), confirmLargeJump: true }).then(() => flush(user.id, qc))}>The reading is right: send it again</Button>
                  )}
                  {c.href && <Link to={c.href} className="font-semibold text-accent underline">Open the bike</Link>}
                  <Button kind="secondary" onClick={() => void dismiss(c.id)}>Dismiss</Button>
                </li>
              ))}
            </ul>
          </section>
        )}
      </div>
    </div>
  );
}
