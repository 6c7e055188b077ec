import { DataTable, type Columns } from '../../../components/ui/data-table';
import { formatDateTime } from '../../../lib/format';
import type { StockLine, StockView } from '../../../../shared/schemas/parts';
import { MOVEMENT_WORDS, signedQty } from '../parts-words';

type Movement = StockView['recent'][number];

/** The ledger's latest lines at the site, newest first: who moved what, and why. */
export function RecentMovements({ recent, items }: { recent: Movement[]; items: StockLine[] }) {
  const parts = new Map(items.map((p) => [p.partId, p]));
  const columns: Columns<Movement> = [
    { id: 'at', accessorKey: 'at', header: 'When', cell: (c) => <span className="num whitespace-nowrap">{formatDateTime(c.row.original.at)}</span> },
    { id: 'part', accessorFn: (m) => parts.get(m.partId)?.name ?? '', header: 'Part', cell: (c) => parts.get(c.row.original.partId)?.name ?? 'A part no longer listed' },
    { id: 'kind', accessorFn: (m) => MOVEMENT_WORDS[m.kind], header: 'What happened' },
    {
      id: 'delta', accessorKey: 'delta', header: 'Change',
      cell: (c) => {
        const unit = parts.get(c.row.original.partId)?.unit ?? 'each';
        return <span className="num font-semibold">{signedQty(c.row.original.delta, unit)}</span>;
      },
    },
    { id: 'reason', accessorKey: 'reason', header: 'Reason', enableSorting: false },
    { id: 'by', accessorFn: (m) => m.by ?? '', header: 'By', cell: (c) => c.row.original.by ?? '—' },
  ];
  return <DataTable caption="Recent stock movements at this site" columns={columns} data={recent} pageSize={15} initialSort={[{ id: 'at', desc: true }]} empty="Nothing has moved at this site yet." />;
}
