import type { ReactNode } from 'react';
import { Link, useParams } from 'react-router-dom';
import { useQuery } from '@tanstack/react-query';
import { DataTable, type Columns } from '../../../components/ui/data-table';
import { RideVerdictPanel } from '../../../components/ui/ride-verdict';
import { ErrorPanel, Loading, SafetyNote } from '../../../components/ui/states';
import { BikeStatusBadge } from '../../../components/ui/status-badge';
import { formatDate, formatKm, formatOdometer } from '../../../lib/format';
import { useMe } from '../../../lib/use-me';
import type { OdometerReading } from '../../../../shared/schemas/bikes';
import { canChangeStatus } from '../../../../shared/domain/policies';
import { bikeQueries } from '../api';
import { BikeTimeline } from '../components/bike-timeline';
import { StatusForm } from '../components/status-form';
import { WhatIsDue } from '../components/what-is-due';

const readingColumns: Columns<OdometerReading> = [
  { id: 'date', accessorKey: 'date', header: 'Date', cell: (c) => <span className="num">{formatDate(c.row.original.date)}</span> },
  {
    id: 'value',
    accessorKey: 'value',
    header: 'Odometer',
    cell: (c) => (
      <span className="num">
        {formatOdometer(c.row.original.value, c.row.original.unit)}
        {c.row.original.reset && <span className="ml-2 rounded bg-state-soon-soft px-1.5 text-sm">new odometer fitted</span>}
      </span>
    ),
  },
  { id: 'km', accessorKey: 'odometerKm', header: 'Distance in service', cell: (c) => <span className="num">{formatKm(c.row.original.odometerKm)}</span> },
  { id: 'source', accessorKey: 'source', header: 'From' },
  { id: 'by', accessorFn: (r) => r.recordedBy ?? '', header: 'Recorded by' },
];

export interface BikePanels {
  /** Panels other features add to the bike's story (valve trends, photos), composed in src/app. */
  panels?: { key: string; title: string; render: (bikeId: string) => ReactNode }[];
  /** Links to more about the bike, e.g. its printable service record. */
  links?: { to: (bikeId: string) => string; label: string }[];
}

export function BikePageRoute({ panels = [], links = [] }: BikePanels) {
  const { id = '' } = useParams();
  const me = useMe();
  const q = useQuery(bikeQueries.detail(id));
  if (q.isPending) return <Loading what="the bike" />;
  if (q.error) return <ErrorPanel error={q.error} retry={() => q.refetch()} />;
  const { bike, readings, due, ride } = q.data;
  return (
    <article className="flex flex-col gap-6">
      <div>
        <Link to="/fleet" className="text-accent underline-offset-4 hover:underline">← Fleet</Link>
        <div className="mt-2 flex flex-wrap items-center gap-3">
          <h1 className="text-display font-bold">{bike.fleetNumber}</h1>
          <BikeStatusBadge status={bike.status} />
        </div>
        <p className="text-lg text-ink-soft">
          {bike.model.name} · {bike.site.name}
        </p>
      </div>
      <RideVerdictPanel ride={ride} />
      <section aria-labelledby="facts" className="grid gap-3 rounded-card border-2 border-ink-line bg-paper-raised p-5 sm:grid-cols-2 lg:grid-cols-4">
        <h2 id="facts" className="sr-only">Details</h2>
        <Fact label="Odometer now" value={formatOdometer(bike.latestOdometer, bike.odometerUnit)} big />
        <Fact label="Last check-in" value={formatDate(bike.latestReadingDate)} />
        <Fact label="Registration" value={bike.registration ?? '—'} />
        <Fact label="VIN" value={bike.vin ?? 'none recorded'} />
        <Fact label="In service since" value={`${formatDate(bike.inServiceDate)} at ${formatOdometer(bike.inServiceOdometer, bike.odometerUnit)}`} />
        <Fact label="Odometer reads" value={bike.odometerUnit === 'mi' ? 'miles' : 'kilometres'} />
      </section>
      {canChangeStatus(me) && <StatusForm bike={bike} />}
      <WhatIsDue bike={bike} due={due} />
      {links.length > 0 && (
        <nav aria-label="More about this bike" className="flex flex-wrap gap-3">
          {links.map((l) => (
            <Link key={l.label} to={l.to(bike.id)} className="inline-flex min-h-tap items-center rounded-card border-2 border-ink-line bg-paper-raised px-4 font-semibold text-accent hover:border-accent">
              {l.label}
            </Link>
          ))}
        </nav>
      )}
      {panels.map((p) => (
        <section key={p.key} aria-label={p.title}>
          {p.render(bike.id)}
        </section>
      ))}
      <BikeTimeline bikeId={bike.id} />
      <section aria-labelledby="history">
        <h2 id="history" className="mb-2 text-xl font-bold">Odometer history</h2>
        <DataTable caption="Odometer history" columns={readingColumns} data={readings} pageSize={20} empty="No check-ins recorded yet." />
      </section>
      <SafetyNote />
    </article>
  );
}

function Fact({ label, value, big }: { label: string; value: string; big?: boolean }) {
  return (
    <div>
      <p className="text-sm text-ink-muted">{label}</p>
      <p className={`num font-semibold ${big ? 'text-reading' : ''}`}>{value}</p>
    </div>
  );
}
