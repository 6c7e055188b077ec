import { DataTable, type Columns } from '../../../components/ui/data-table';
import { ToneBadge } from '../../../components/ui/tone-badge';
import type { z } from 'zod';
import type { RollupRowSchema } from '../../../../shared/schemas/valves';

type RollupRow = z.infer<typeof RollupRowSchema>;

const columns: Columns<RollupRow> = [
  { id: 'model', accessorKey: 'modelName', header: 'Model', cell: (c) => <span className="font-semibold">{c.row.original.modelName}</span> },
  { id: 'position', accessorKey: 'position', header: 'Valve position' },
  { id: 'bikes', accessorKey: 'bikes', header: 'Bikes with a trend', cell: (c) => <span className="num">{c.row.original.bikes}</span> },
  { id: 'tightening', accessorKey: 'tightening', header: 'Closing up', cell: (c) => <span className="num">{c.row.original.tightening} of {c.row.original.bikes}</span> },
  {
    id: 'median',
    accessorFn: (r) => r.medianMmPer1000Km ?? -Infinity,
    header: 'Median closure',
    cell: (c) => <span className="num whitespace-nowrap">{c.row.original.medianMmPer1000Km == null ? '—' : `${c.row.original.medianMmPer1000Km.toFixed(4)} mm per 1,000 km`}</span>,
  },
  {
    id: 'flagged',
    accessorFn: (r) => (r.flagged ? 0 : 1),
    header: 'Pattern',
    cell: (c) => (c.row.original.flagged ? <ToneBadge tone="soon" icon="⚑">Flagged</ToneBadge> : <ToneBadge tone="ok" icon="✓">No pattern</ToneBadge>),
  },
  { id: 'suggestion', accessorFn: (r) => r.suggestion ?? '', header: 'Suggestion', enableSorting: false, cell: (c) => c.row.original.suggestion ?? <span className="text-ink-muted">—</span> },
];

/** Per model and valve position: is a closing-up pattern shared across the fleet? */
export function RollupTable({ items }: { items: RollupRow[] }) {
  return (
    <DataTable
      caption="Valve clearance trends per model and valve position"
      columns={columns}
      data={items}
      empty="No model has enough valve checks for a trend yet (three checks per bike)."
    />
  );
}
