import { Link, useNavigate } from 'react-router-dom';
import { useQueries, useQuery } from '@tanstack/react-query';
import { DataTable, type Columns } from '../../../components/ui/data-table';
import { Empty, ErrorPanel, Loading, PageHeader, SafetyNote } from '../../../components/ui/states';
import { referenceQueries } from '../../../lib/reference-queries';
import { useMe } from '../../../lib/use-me';
import type { ModelSummary } from '../../../../shared/schemas/reference';
import { planQueries } from '../api';
import { adjusterWords, engineWords } from '../engine-words';
import { mm } from '../form-values';

type Row = ModelSummary & { bikes: number | null };

const columns: Columns<Row> = [
  { id: 'name', accessorKey: 'name', header: 'Model', cell: (c) => <Link to={`/plans/${c.row.original.id}`} className="font-semibold text-accent underline-offset-4 hover:underline">{c.row.original.name}</Link> },
  { id: 'engine', accessorFn: (m) => m.cylinders, header: 'Engine', cell: (c) => engineWords(c.row.original) },
  {
    id: 'valves',
    accessorFn: (m) => m.intakeMinMm,
    header: 'Clearances, cold',
    cell: (c) => (
      <span className="num whitespace-nowrap">
        Intake {mm(c.row.original.intakeMinMm)}–{mm(c.row.original.intakeMaxMm)} mm
        <br />
        Exhaust {mm(c.row.original.exhaustMinMm)}–{mm(c.row.original.exhaustMaxMm)} mm
      </span>
    ),
  },
  { id: 'adjuster', accessorKey: 'adjuster', header: 'Adjuster', cell: (c) => <span className="num">{adjusterWords(c.row.original)}</span> },
  { id: 'bikes', accessorFn: (m) => m.bikes ?? -1, header: 'Bikes', cell: (c) => <span className="num">{c.row.original.bikes ?? '…'}</span> },
];

/** Every model with its valve specs; a manager opens one to change its engine data or service plan. */
export function PlansRoute() {
  const me = useMe();
  const navigate = useNavigate();
  const models = useQuery(referenceQueries.models());
  // The list carries no bike counts; each model's plan does, and opening a model then needs no second fetch.
  const details = useQueries({ queries: (models.data?.items ?? []).map((m) => planQueries.detail(m.id)) });
  const rows: Row[] = (models.data?.items ?? []).map((m, i) => ({ ...m, bikes: details[i]?.data?.bikes ?? null }));
  return (
    <>
      <PageHeader title="Models and plans">
        {me.role === 'manager' && <Link to="/plans/new" className="inline-flex min-h-tap items-center rounded-card bg-accent px-4 font-semibold text-white hover:bg-accent-strong">Add a model</Link>}
      </PageHeader>
      <p className="mb-4 max-w-3xl text-ink-soft">Each model has its valve clearances and its service plan: what is done, how often, and what the technician records. A change moves the dues of every bike of the model.</p>
      {models.isPending ? (
        <Loading what="models" />
      ) : models.error ? (
        <ErrorPanel error={models.error} retry={() => models.refetch()} />
      ) : rows.length === 0 ? (
        <Empty title="No models yet">{me.role === 'manager' ? 'Add the first with “Add a model”, then give it a service plan.' : 'A fleet manager adds models and their service plans.'}</Empty>
      ) : (
        <DataTable caption="Models and plans" columns={columns} data={rows} initialSort={[{ id: 'name', desc: false }]} onRowClick={(m) => navigate(`/plans/${m.id}`)} />
      )}
      <SafetyNote />
    </>
  );
}
