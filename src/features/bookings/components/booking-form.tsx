import { useState, type FormEvent } from 'react';
import { useQuery } from '@tanstack/react-query';
import { TZDate } from '@date-fns/tz';
import { Button } from '../../../components/ui/button';
import { SelectField, TextField } from '../../../components/ui/field';
import { Segmented } from '../../../components/ui/segmented';
import { ApiError } from '../../../lib/api-client';
import { BookingCreateSchema, type BookingCreateInput, type BookingKind } from '../../../../shared/schemas/bookings';
import type { Site } from '../../../../shared/schemas/reference';
import { bookingQueries, useCreateBooking } from '../api';

interface Props {
  sites: Site[];
  models: { id: string; name: string }[];
  defaultSiteId: string;
}

/** The site's wall-clock time as an instant with its offset, e.g. 2026-12-12T09:00:00.000+00:00. */
export function siteTime(day: string, time: string, timeZone: string) {
  const [y, m, d] = day.split('-').map(Number);
  const [h, mi] = time.split(':').map(Number);
  if (!y || !m || !d || Number.isNaN(h) || Number.isNaN(mi)) return '';
  return new TZDate(y, m - 1, d, h, mi, 0, timeZone).toISOString();
}

export function BookingForm({ sites, models, defaultSiteId }: Props) {
  const [siteId, setSiteId] = useState(defaultSiteId);
  const [kind, setKind] = useState<BookingKind>('hire');
  const [what, setWhat] = useState<'bike' | 'model'>('bike');
  const [bikeId, setBikeId] = useState('');
  const [modelId, setModelId] = useState('');
  const [quantity, setQuantity] = useState('1');
  const [day, setDay] = useState('');
  const [startTime, setStartTime] = useState('09:00');
  const [endDay, setEndDay] = useState('');
  const [endTime, setEndTime] = useState('17:00');
  const [title, setTitle] = useState('');
  const [weeklyUntil, setWeeklyUntil] = useState('');
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [saved, setSaved] = useState('');
  const site = sites.find((s) => s.id === siteId);
  const bikes = useQuery(bookingQueries.bikes(siteId));
  const create = useCreateBooking();

  async function submit(e: FormEvent) {
    e.preventDefault();
    setSaved('');
    const tz = site?.timeZone ?? 'Europe/London';
    const input: BookingCreateInput = {
      siteId, kind, title,
      bikeId: what === 'bike' ? bikeId || null : null,
      modelId: what === 'model' ? modelId || null : null,
      quantity: what === 'model' ? Number(quantity) : 1,
      start: siteTime(day, startTime, tz),
      end: siteTime(endDay || day, endTime, tz),
      rrule: weeklyUntil ? `FREQ=WEEKLY;UNTIL=${weeklyUntil.replaceAll('-', '')}` : null,
    };
    // The same schema the server checks with: the person sees the message before anything is sent.
    const parsed = BookingCreateSchema.safeParse(input);
    if (!parsed.success) {
      setErrors(Object.fromEntries(parsed.error.issues.map((i) => [String(i.path[0] ?? 'form'), i.message])));
      return;
    }
    setErrors({});
    try {
      const b = await create.mutateAsync(input);
      setSaved(`Booked: ${b.fleetNumber ?? `${b.quantity} × ${b.modelName}`}, ${b.occurrences.length ? 'shown in the list' : 'outside the dates shown'}.`);
    } catch (err) {
      if (err instanceof ApiError) setErrors({ ...Object.fromEntries(err.details.map((d) => [d.path, d.message])), form: err.message });
      else throw err;
    }
  }

  return (
    <form onSubmit={submit} aria-labelledby="add-booking" className="flex flex-col gap-4 rounded-card border-2 border-ink-line bg-paper-raised p-4">
      <h2 id="add-booking" className="text-xl font-bold">Add a booking</h2>
      <div className="grid gap-4 md:grid-cols-3">
        <SelectField label="Site" value={siteId} onChange={(e) => setSiteId(e.target.value)} error={errors.siteId}>
          {sites.map((s) => <option key={s.id} value={s.id}>{s.name}</option>)}
        </SelectField>
        <Segmented legend="Kind" value={kind} onChange={setKind} options={[{ value: 'hire', label: 'Hire' }, { value: 'lesson', label: 'Lesson' }]} />
        <Segmented legend="Book" value={what} onChange={setWhat} options={[{ value: 'bike', label: 'One bike' }, { value: 'model', label: 'Bikes of a model' }]} />
      </div>
      <div className="grid gap-4 md:grid-cols-3">
        {what === 'bike' ? (
          <SelectField label="Bike" value={bikeId} onChange={(e) => setBikeId(e.target.value)} error={errors.bikeId}>
            <option value="">Choose a bike</option>
            {(bikes.data?.items ?? []).filter((b) => b.status !== 'retired').map((b) => <option key={b.id} value={b.id}>{b.fleetNumber} · {b.model.name}</option>)}
          </SelectField>
        ) : (
          <>
            <SelectField label="Model" value={modelId} onChange={(e) => setModelId(e.target.value)} error={errors.modelId ?? errors.bikeId}>
              <option value="">Choose a model</option>
              {models.map((m) => <option key={m.id} value={m.id}>{m.name}</option>)}
            </SelectField>
            <TextField label="How many bikes" type="number" min={1} inputMode="numeric" value={quantity} onChange={(e) => setQuantity(e.target.value)} error={errors.quantity} />
          </>
        )}
        <TextField label="Title" value={title} onChange={(e) => setTitle(e.target.value)} error={errors.title} hint="e.g. the customer or the course" />
      </div>
      <div className="grid gap-4 md:grid-cols-4">
        <TextField label="Start day" type="date" value={day} onChange={(e) => setDay(e.target.value)} error={errors.start} />
        <TextField label="Start time" type="time" value={startTime} onChange={(e) => setStartTime(e.target.value)} hint={site ? `${site.name} time` : undefined} />
        <TextField label="End day" type="date" value={endDay} onChange={(e) => setEndDay(e.target.value)} hint="Empty: the start day" error={errors.end} />
        <TextField label="End time" type="time" value={endTime} onChange={(e) => setEndTime(e.target.value)} />
      </div>
      <TextField label="Repeat weekly until" type="date" value={weeklyUntil} onChange={(e) => setWeeklyUntil(e.target.value)} error={errors.rrule} hint="Empty: once only" className="md:w-1/3" />
      {errors.form && <p role="alert" className="font-semibold text-state-stop">⚠ {errors.form}</p>}
      {saved && <p role="status" className="font-semibold">✓ {saved}</p>}
      <div>
        <Button type="submit" disabled={create.isPending}>{create.isPending ? 'Saving…' : 'Add booking'}</Button>
      </div>
    </form>
  );
}
