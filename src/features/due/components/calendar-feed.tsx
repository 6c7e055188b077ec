import { useRef, useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { Button } from '../../../components/ui/button';
import { ErrorPanel, Loading } from '../../../components/ui/states';
import { dueQueries, useResetFeed } from '../api';

/** The person's secret calendar address: calendar apps subscribe to it and show due work as all-day events. */
export function CalendarFeed() {
  const feed = useQuery(dueQueries.feed());
  const reset = useResetFeed();
  const input = useRef<HTMLInputElement>(null);
  const [copied, setCopied] = useState(false);
  const [confirming, setConfirming] = useState(false);

  const copy = async (url: string) => {
    try {
      await navigator.clipboard.writeText(url);
      setCopied(true);
    } catch {
      // Without clipboard access (plain HTTP, old browser) the address is selected for copying by hand.
      input.current?.select();
    }
  };

  return (
    <section aria-labelledby="feed" className="rounded-card border-2 border-ink-line bg-paper-raised p-5">
      <h2 id="feed" className="text-xl font-bold">Calendar feed</h2>
      <p className="mt-1 max-w-3xl text-ink-soft">
        Add this address to your calendar app as a subscription (“add calendar from URL”). It shows the due work of your sites for the next
        90 days, one all-day event per item, and refreshes on its own. Anyone with the address can read it: keep it to yourself.
      </p>
      {feed.isPending ? (
        <Loading what="your calendar address" />
      ) : feed.error ? (
        <ErrorPanel error={feed.error} retry={() => feed.refetch()} />
      ) : (
        <>
          <div className="mt-3 flex flex-wrap items-center gap-2">
            <label htmlFor="feed-url" className="sr-only">Your calendar address</label>
            <input id="feed-url" ref={input} readOnly value={feed.data.url} onFocus={(e) => e.target.select()} className="num min-h-tap min-w-0 flex-1 rounded-card border-2 border-ink-line bg-paper px-3 font-mono text-sm" />
            <Button kind="secondary" onClick={() => copy(feed.data.url)}>{copied ? '✓ Copied' : 'Copy address'}</Button>
          </div>
          {confirming ? (
            <div role="alert" className="mt-3 rounded-card border-2 border-state-soon bg-state-soon-soft p-3">
              <p>◔ The current address stops working at once; calendars subscribed to it get nothing more. Make a new one?</p>
              <div className="mt-2 flex gap-2">
                <Button disabled={reset.isPending} onClick={() => reset.mutate(undefined, { onSuccess: () => { setConfirming(false); setCopied(false); } })}>
                  Yes, make a new address
                </Button>
                <Button kind="secondary" onClick={() => setConfirming(false)}>Keep the current one</Button>
              </div>
            </div>
          ) : (
            <Button kind="quiet" className="mt-2" onClick={() => setConfirming(true)}>Make a new address</Button>
          )}
          {reset.isSuccess && !confirming && <p role="status" className="mt-2">✓ New address made. The old one no longer works; subscribe again with this one.</p>}
          {reset.error && <p role="alert" className="mt-2 text-state-stop">⚠ {reset.error.message}</p>}
        </>
      )}
    </section>
  );
}
