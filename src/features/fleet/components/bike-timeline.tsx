import { useState } from 'react';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { Button } from '../../../components/ui/button';
import { Empty, ErrorPanel, Loading } from '../../../components/ui/states';
import { ToneBadge, type Tone } from '../../../components/ui/tone-badge';
import { api } from '../../../lib/api-client';
import { formatDateTime } from '../../../lib/format';
import { bikeQueries } from '../api';

const KINDS = ['check-in', 'odometer-replaced', 'defect', 'task-raised', 'task-closed', 'service', 'valve-check', 'status'] as const;
type Kind = (typeof KINDS)[number];

const TimelineSchema = z.object({
  items: z.array(z.object({ at: z.string(), kind: z.enum(KINDS), title: z.string(), detail: z.string().nullable(), by: z.string().nullable() })),
});

// Under the bikes key, so a check-in, a sign-off or a state change refreshes it with the rest of the page.
const timelineQuery = (id: string) =>
  queryOptions({ queryKey: [...bikeQueries.all(), 'timeline', id], queryFn: () => api.get(`/api/bikes/${id}/timeline`, TimelineSchema) });

// Each kind in words and a shape as well as a colour.
const KIND: Record<Kind, { label: string; icon: string; tone: Tone }> = {
  'check-in': { label: 'Check-in', icon: '◉', tone: 'neutral' },
  'odometer-replaced': { label: 'Odometer replaced', icon: '⟲', tone: 'soon' },
  defect: { label: 'Defect', icon: '!', tone: 'stop' },
  'task-raised': { label: 'Work raised', icon: '○', tone: 'neutral' },
  'task-closed': { label: 'Task closed', icon: '☑', tone: 'ok' },
  service: { label: 'Service done', icon: '✓', tone: 'ok' },
  'valve-check': { label: 'Valve check', icon: '◇', tone: 'info' },
  status: { label: 'State', icon: '◆', tone: 'info' },
};

const PAGE = 30;

/** The bike's story, newest first, thirty at a time. */
export function BikeTimeline({ bikeId }: { bikeId: string }) {
  const q = useQuery(timelineQuery(bikeId));
  const [shown, setShown] = useState(PAGE);
  return (
    <section aria-labelledby="timeline" className="flex flex-col gap-2">
      <h2 id="timeline" className="text-xl font-bold">History</h2>
      {q.isPending ? (
        <Loading what="the history" />
      ) : q.error ? (
        <ErrorPanel error={q.error} retry={() => q.refetch()} />
      ) : q.data.items.length === 0 ? (
        <Empty title="Nothing recorded yet">Check-ins, defects, work and state changes appear here as they happen.</Empty>
      ) : (
        <>
          <ol className="divide-y divide-ink-line rounded-card border-2 border-ink-line bg-paper-raised">
            {q.data.items.slice(0, shown).map((e, i) => (
              <li key={`${e.at}-${e.kind}-${i}`} className="grid gap-x-4 gap-y-1 px-4 py-3 sm:grid-cols-[11rem_10rem_1fr]">
                <time dateTime={e.at} className="num text-ink-soft">{formatDateTime(e.at)}</time>
                <span><ToneBadge tone={KIND[e.kind].tone} icon={KIND[e.kind].icon}>{KIND[e.kind].label}</ToneBadge></span>
                <div>
                  <p className="font-semibold">{e.title}</p>
                  {e.detail && <p className="num text-ink-soft">{e.detail}</p>}
                  {e.by && <p className="text-sm text-ink-muted">by {e.by}</p>}
                </div>
              </li>
            ))}
          </ol>
          <div className="flex flex-wrap items-center gap-3">
            <span className="num text-sm text-ink-soft">Showing {Math.min(shown, q.data.items.length)} of {q.data.items.length}</span>
            {shown < q.data.items.length && (
              <Button kind="secondary" onClick={() => setShown(shown + PAGE)}>Show {Math.min(PAGE, q.data.items.length - shown)} more</Button>
            )}
          </div>
        </>
      )}
    </section>
  );
}
