import { DataTable, type Columns } from '../../../components/ui/data-table';
import type { ReorderLine } from '../api';
import { fmtSize } from '../stock-rows';

const columns: Columns<ReorderLine> = [
  { id: 'size', accessorKey: 'sizeMm', header: 'Size', cell: (c) => <span className="num font-semibold">{fmtSize(c.row.original.sizeMm)}</span> },
  { id: 'need', accessorKey: 'need', header: 'Order', cell: (c) => <span className="num">{c.row.original.need}</span> },
  { id: 'why', accessorFn: (r) => r.reasons.join('; '), header: 'Why', enableSorting: false },
];

/** What to buy: shims the open valve cards need beyond the shelf, and sizes under their minimum. */
export function ReorderList({ items }: { items: ReorderLine[] }) {
  return <DataTable caption="Shims to order" columns={columns} data={items} pageSize={100} empty="Nothing to order: the shelf covers the open valve cards and every minimum." />;
}
