import { useState, type FormEvent } from 'react';
import { useQuery } from '@tanstack/react-query';
import { Button } from '../../../components/ui/button';
import { SelectField, TextField } from '../../../components/ui/field';
import { Loading, ErrorPanel } from '../../../components/ui/states';
import { ApiError } from '../../../lib/api-client';
import type { BookingKind } from '../../../../shared/schemas/bookings';
import type { Site } from '../../../../shared/schemas/reference';
import { bookingQueries, useCreateFeed, useDeleteFeed } from '../api';

interface Props {
  sites: Site[];
  models: { id: string; name: string }[];
}

/** Calendars (.ics links) the bookings are read from, every quarter of an hour, with how the last load went. */
export function FeedsPanel({ sites, models }: Props) {
  const feeds = useQuery(bookingQueries.feeds());
  const create = useCreateFeed();
  const remove = useDeleteFeed();
  const [siteId, setSiteId] = useState(sites[0]?.id ?? '');
  const [name, setName] = useState('');
  const [url, setUrl] = useState('');
  const [kind, setKind] = useState<BookingKind>('hire');
  const [defaultModelId, setDefaultModelId] = useState('');
  const [result, setResult] = useState('');
  const [error, setError] = useState<ApiError | null>(null);

  async function submit(e: FormEvent) {
    e.preventDefault();
    setError(null);
    setResult('');
    try {
      const r = await create.mutateAsync({ siteId, name, url, kind, defaultModelId: defaultModelId || null });
      setResult(`${r.feed.name}: ${r.result.message}`);
      setName('');
      setUrl('');
    } catch (err) {
      if (err instanceof ApiError) setError(err);
      else throw err;
    }
  }

  return (
    <section aria-labelledby="feeds" className="flex flex-col gap-3 rounded-card border-2 border-ink-line bg-paper-raised p-4">
      <h2 id="feeds" className="text-xl font-bold">Calendar feeds</h2>
      <p className="text-ink-soft">Each event needs a fleet number (e.g. SM-07) or a model’s name with a count (e.g. “Breeze 125 ×3”) in its title, description or place; events naming neither count as skipped unless the feed has a default model.</p>
      {feeds.isPending ? (
        <Loading what="calendar feeds" />
      ) : feeds.isError ? (
        <ErrorPanel error={feeds.error} retry={() => void feeds.refetch()} />
      ) : feeds.data.items.length === 0 ? (
        <p className="font-semibold">No calendar feeds yet.</p>
      ) : (
        <ul className="flex flex-col gap-2">
          {feeds.data.items.map((f) => (
            <li key={f.id} className="flex flex-wrap items-center justify-between gap-3 rounded-card border-2 border-ink-line p-3">
              <div>
                <p className="font-semibold">{f.name} · {f.siteName} · {f.kind === 'hire' ? 'hires' : 'lessons'}{f.defaultModelName ? ` · otherwise ${f.defaultModelName}` : ''}</p>
                <p className="break-all text-sm text-ink-soft">{f.url}</p>
                <p className={f.lastError ? 'font-semibold text-state-stop' : ''}>
                  <span aria-hidden>{f.lastError ? '⚠ ' : '✓ '}</span>{f.status}
                </p>
              </div>
              <Button kind="secondary" onClick={() => remove.mutate(f.id)} disabled={remove.isPending} aria-label={`Remove feed ${f.name} and its bookings`}>Remove</Button>
            </li>
          ))}
        </ul>
      )}
      <form onSubmit={submit} className="grid gap-3 md:grid-cols-3" aria-label="Add a calendar feed">
        <SelectField label="Site" value={siteId} onChange={(e) => setSiteId(e.target.value)} error={error?.field('siteId')}>
          {sites.map((s) => <option key={s.id} value={s.id}>{s.name}</option>)}
        </SelectField>
        <TextField label="Name" value={name} onChange={(e) => setName(e.target.value)} error={error?.field('name')} hint="e.g. Online hires" />
        <TextField label="Address (.ics)" type="url" value={url} onChange={(e) => setUrl(e.target.value)} error={error?.field('url')} placeholder="https://" />
        <SelectField label="Bookings are" value={kind} onChange={(e) => setKind(e.target.value as BookingKind)}>
          <option value="hire">Hires</option>
          <option value="lesson">Lessons</option>
        </SelectField>
        <SelectField label="Model when an event names none" value={defaultModelId} onChange={(e) => setDefaultModelId(e.target.value)} error={error?.field('defaultModelId')}>
          <option value="">None: skip such events</option>
          {models.map((m) => <option key={m.id} value={m.id}>{m.name}</option>)}
        </SelectField>
        <div className="flex items-end">
          <Button type="submit" disabled={create.isPending}>{create.isPending ? 'Loading the calendar…' : 'Add and load now'}</Button>
        </div>
      </form>
      {error && <p role="alert" className="font-semibold text-state-stop">⚠ {error.message}</p>}
      {result && <p role="status" className="font-semibold">{result}</p>}
    </section>
  );
}
