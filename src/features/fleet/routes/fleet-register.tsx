import { useMemo } from 'react';
import { Link, useNavigate, useSearchParams } from 'react-router-dom';
import { useQuery } from '@tanstack/react-query';
import { DataTable, type Columns } from '../../../components/ui/data-table';
import { SelectField, TextField } from '../../../components/ui/field';
import { Empty, ErrorPanel, Loading, PageHeader } from '../../../components/ui/states';
import { BikeStatusBadge } from '../../../components/ui/status-badge';
import { referenceQueries } from '../../../lib/reference-queries';
import { formatDate, formatOdometer } from '../../../lib/format';
import { useMe } from '../../../lib/use-me';
import { BIKE_STATUSES, BIKE_STATUS_LABELS, type BikeSummary } from '../../../../shared/schemas/bikes';
import { canManageFleet } from '../../../../shared/domain/policies';
import { bikeQueries } from '../api';

const columns: Columns<BikeSummary> = [
  {
    id: 'fleetNumber',
    accessorKey: 'fleetNumber',
    header: 'Fleet no.',
    cell: (c) => (
      <Link to={`/fleet/${c.row.original.id}`} className="font-bold text-accent underline-offset-4 hover:underline">
        {c.row.original.fleetNumber}
      </Link>
    ),
  },
  { id: 'registration', accessorFn: (b) => b.registration ?? '', header: 'Registration' },
  { id: 'model', accessorFn: (b) => b.model.name, header: 'Model' },
  { id: 'site', accessorFn: (b) => b.site.name, header: 'Site' },
  { id: 'status', accessorKey: 'status', header: 'State', cell: (c) => <BikeStatusBadge status={c.row.original.status} /> },
  {
    id: 'odometer',
    accessorFn: (b) => b.latestOdometerKm ?? -1,
    header: 'Odometer',
    cell: (c) => <span className="num">{formatOdometer(c.row.original.latestOdometer, c.row.original.odometerUnit)}</span>,
  },
  { id: 'lastSeen', accessorFn: (b) => b.latestReadingDate ?? '', header: 'Last check-in', cell: (c) => <span className="num">{formatDate(c.row.original.latestReadingDate)}</span> },
];

export function FleetRegisterRoute() {
  const me = useMe();
  const navigate = useNavigate();
  const [params, setParams] = useSearchParams();
  const f = { site: params.get('site') ?? '', model: params.get('model') ?? '', status: params.get('status') ?? '', q: params.get('q') ?? '' };
  const set = (k: keyof typeof f) => (e: { target: { value: string } }) => {
    const p = new URLSearchParams(params);
    if (e.target.value) p.set(k, e.target.value);
    else p.delete(k);
    setParams(p, { replace: true });
  };
  const bikes = useQuery(bikeQueries.list());
  const sites = useQuery(referenceQueries.sites());
  const models = useQuery(referenceQueries.models());
  const rows = useMemo(() => {
    const q = f.q.trim().toLowerCase();
    return (bikes.data?.items ?? []).filter(
      (b) =>
        (!f.site || b.site.id === f.site) &&
        (!f.model || b.model.id === f.model) &&
        (!f.status || b.status === f.status) &&
        (!q || b.fleetNumber.toLowerCase().includes(q) || (b.registration ?? '').toLowerCase().includes(q)),
    );
  }, [bikes.data, f.site, f.model, f.status, f.q]);

  return (
    <>
      <PageHeader title="Fleet">
        {canManageFleet(me) && (
          <Link to="/fleet/new" className="inline-flex min-h-tap items-center rounded-card bg-accent px-4 font-semibold text-white hover:bg-accent-strong">
            Add a bike
          </Link>
        )}
      </PageHeader>
      <div className="mb-4 grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
        <TextField label="Search" placeholder="Fleet number or registration" value={f.q} onChange={set('q')} type="search" />
        <SelectField label="Site" value={f.site} onChange={set('site')}>
          <option value="">All my sites</option>
          {sites.data?.items.map((s) => <option key={s.id} value={s.id}>{s.name}</option>)}
        </SelectField>
        <SelectField label="Model" value={f.model} onChange={set('model')}>
          <option value="">All models</option>
          {models.data?.items.map((m) => <option key={m.id} value={m.id}>{m.name}</option>)}
        </SelectField>
        <SelectField label="State" value={f.status} onChange={set('status')}>
          <option value="">Any state</option>
          {BIKE_STATUSES.map((s) => <option key={s} value={s}>{BIKE_STATUS_LABELS[s]}</option>)}
        </SelectField>
      </div>
      {bikes.isPending ? (
        <Loading what="the fleet" />
      ) : bikes.error ? (
        <ErrorPanel error={bikes.error} retry={() => bikes.refetch()} />
      ) : bikes.data.items.length === 0 ? (
        <Empty title="No bikes yet">{canManageFleet(me) ? 'Add the first bike with “Add a bike”.' : 'A manager adds bikes to the fleet.'}</Empty>
      ) : (
        <DataTable
          caption="Fleet register"
          columns={columns}
          data={rows}
          initialSort={[{ id: 'fleetNumber', desc: false }]}
          empty="No bike matches these filters."
          onRowClick={(b) => navigate(`/fleet/${b.id}`)}
        />
      )}
    </>
  );
}
