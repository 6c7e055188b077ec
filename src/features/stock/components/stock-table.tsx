import { Button } from '../../../components/ui/button';
import { DataTable, type Columns } from '../../../components/ui/data-table';
import { ToneBadge } from '../../../components/ui/tone-badge';
import { fmtSize, type SizeRow } from '../stock-rows';

function State({ r }: { r: SizeRow }) {
  if (r.short > 0) return <ToneBadge tone="stop" icon="!">Below minimum: {r.short} short</ToneBadge>;
  if (r.newCount + r.usedCount === 0) return <ToneBadge tone="neutral" icon="○">None on the shelf</ToneBadge>;
  return <ToneBadge tone="ok" icon="✓">In stock</ToneBadge>;
}

export function StockTable({ rows, onPick }: { rows: SizeRow[]; onPick?: (sizeMm: number) => void }) {
  const columns: Columns<SizeRow> = [
    { id: 'size', accessorKey: 'sizeMm', header: 'Size', cell: (c) => <span className="num font-semibold">{fmtSize(c.row.original.sizeMm)}</span> },
    { id: 'new', accessorKey: 'newCount', header: 'New', cell: (c) => <span className="num">{c.row.original.newCount}</span> },
    { id: 'used', accessorKey: 'usedCount', header: 'Used', cell: (c) => <span className="num">{c.row.original.usedCount}</span> },
    { id: 'min', accessorKey: 'minCount', header: 'Minimum', cell: (c) => <span className="num">{c.row.original.minCount || '—'}</span> },
    { id: 'state', accessorFn: (r) => (r.short > 0 ? 0 : r.newCount + r.usedCount === 0 ? 1 : 2), header: 'State', cell: (c) => <State r={c.row.original} /> },
    ...(onPick
      ? [{ id: 'act', header: '', enableSorting: false, cell: (c: { row: { original: SizeRow } }) => <Button kind="secondary" onClick={() => onPick(c.row.original.sizeMm)}>Change count</Button> }]
      : []),
  ];
  return <DataTable caption="Shims on the shelf by size" columns={columns} data={rows} pageSize={100} empty="No shim sizes at this site yet." />;
}
