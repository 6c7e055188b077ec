import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { Empty, ErrorPanel, Loading, PageHeader } from '../../../components/ui/states';
import { SelectField, TextField } from '../../../components/ui/field';
import { referenceQueries } from '../../../lib/reference-queries';
import { useMe } from '../../../lib/use-me';
import { addDaysIso, todayIso } from '../../../lib/format';
import { ApiError } from '../../../lib/api-client';
import { canManageFleet } from '../../../../shared/domain/policies';
import type { Booking } from '../../../../shared/schemas/bookings';
import { bookingQueries, useDeleteBooking } from '../api';
import { BookingsTable, bikesOf } from '../components/bookings-table';
import { BookingForm } from '../components/booking-form';
import { BookingImport } from '../components/booking-import';
import { FeedsPanel } from '../components/feeds-panel';

/** When bikes are needed: hires and lesson blocks by site and dates, added by hand, from a file or from calendars. */
export function BookingsRoute() {
  const me = useMe();
  const sites = useQuery(referenceQueries.sites());
  const models = useQuery(referenceQueries.models());
  const mySites = (sites.data?.items ?? []).filter((s) => me.siteIds.includes(s.id));
  const [site, setSite] = useState('');
  const [from, setFrom] = useState(todayIso());
  const [to, setTo] = useState(addDaysIso(todayIso(), 21));
  const list = useQuery(bookingQueries.list({ site: site || undefined, from, to }));
  const remove = useDeleteBooking();
  const [notice, setNotice] = useState('');
  const canBook = me.role === 'desk' || canManageFleet(me);

  async function del(b: Booking) {
    setNotice('');
    try {
      await remove.mutateAsync(b.id);
      setNotice(`Deleted the booking of ${bikesOf(b)}.`);
    } catch (e) {
      if (e instanceof ApiError) setNotice(e.message);
      else throw e;
    }
  }

  return (
    <div className="mx-auto flex max-w-6xl flex-col gap-6 p-4">
      <PageHeader title="Bookings" />
      <p className="text-ink-soft">The workshop plan keeps a booked bike out of the workshop, and keeps enough bikes of a model free for bookings by model.</p>
      <div className="grid gap-3 md:grid-cols-3">
        <SelectField label="Site" value={site} onChange={(e) => setSite(e.target.value)}>
          <option value="">All my sites</option>
          {mySites.map((s) => <option key={s.id} value={s.id}>{s.name}</option>)}
        </SelectField>
        <TextField label="From" type="date" value={from} onChange={(e) => setFrom(e.target.value)} />
        <TextField label="To (inclusive)" type="date" value={to} onChange={(e) => setTo(e.target.value)} />
      </div>
      {notice && <p role="status" className="font-semibold">{notice}</p>}
      {list.isPending ? (
        <Loading what="bookings" />
      ) : list.isError ? (
        <ErrorPanel error={list.error} retry={() => void list.refetch()} />
      ) : list.data.items.length === 0 ? (
        <Empty title="No bookings in these dates">Add one below, import a file, or connect a calendar.</Empty>
      ) : (
        <BookingsTable items={list.data.items} canDelete={canBook} onDelete={(b) => void del(b)} deleting={remove.isPending ? (remove.variables ?? null) : null} />
      )}
      {canBook && mySites.length > 0 && <BookingForm sites={mySites} models={models.data?.items ?? []} defaultSiteId={site || mySites[0].id} />}
      {canBook && <BookingImport />}
      {canManageFleet(me) && mySites.length > 0 && <FeedsPanel sites={mySites} models={models.data?.items ?? []} />}
    </div>
  );
}
