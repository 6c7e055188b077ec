import { useState } from 'react';
import { Button } from '../../../components/ui/button';
import { DataTable, type Columns } from '../../../components/ui/data-table';
import { SelectField, TextField } from '../../../components/ui/field';
import { ToneBadge } from '../../../components/ui/tone-badge';
import { PART_FAMILIES, formatQty, roundQty, type PartFamily } from '../../../../shared/domain/parts';
import type { StockLine } from '../../../../shared/schemas/parts';
import { FAMILY_WORDS } from '../parts-words';

function State({ r }: { r: StockLine }) {
  if (r.onHand < r.minimum) return <ToneBadge tone="stop" icon="!">Below minimum: {formatQty(roundQty(r.minimum - r.onHand), r.unit)} short</ToneBadge>;
  if (r.onHand <= 0) return <ToneBadge tone="neutral" icon="○">None on the shelf</ToneBadge>;
  return <ToneBadge tone="ok" icon="✓">In stock</ToneBadge>;
}

const Qty = ({ n, r }: { n: number; r: StockLine }) => <span className="num">{formatQty(n, r.unit)}</span>;

/** The site's shelf, one row a part, with a filter by family or by number and name. */
export function PartStockTable({ items, onPick }: { items: StockLine[]; onPick?: (partId: string) => void }) {
  const [family, setFamily] = useState<PartFamily | ''>('');
  const [text, setText] = useState('');
  const words = text.trim().toLowerCase();
  const rows = items.filter((r) => (!family || r.family === family) && (!words || `${r.partNumber} ${r.name}`.toLowerCase().includes(words)));
  const columns: Columns<StockLine> = [
    { id: 'number', accessorKey: 'partNumber', header: 'Part number', cell: (c) => <span className="num font-semibold">{c.row.original.partNumber}</span> },
    { id: 'name', accessorKey: 'name', header: 'Name' },
    { id: 'onHand', accessorKey: 'onHand', header: 'On hand', cell: (c) => <Qty n={c.row.original.onHand} r={c.row.original} /> },
    { id: 'minimum', accessorKey: 'minimum', header: 'Minimum', cell: (c) => <Qty n={c.row.original.minimum} r={c.row.original} /> },
    { id: 'onOrder', accessorKey: 'onOrder', header: 'On order', cell: (c) => <Qty n={c.row.original.onOrder} r={c.row.original} /> },
    { id: 'state', accessorFn: (r) => (r.onHand < r.minimum ? 0 : r.onHand <= 0 ? 1 : 2), header: 'State', cell: (c) => <State r={c.row.original} /> },
    ...(onPick
      ? [{ id: 'act', header: '', enableSorting: false, cell: (c: { row: { original: StockLine } }) => <Button kind="secondary" onClick={() => onPick(c.row.original.partId)} aria-label={`Book a movement of ${c.row.original.name}`}>Book</Button> }]
      : []),
  ];
  return (
    <div className="flex flex-col gap-3">
      <div className="flex flex-wrap items-end gap-4">
        <SelectField label="Family" value={family} onChange={(e) => setFamily(e.target.value as PartFamily | '')} className="w-56">
          <option value="">All families</option>
          {PART_FAMILIES.map((f) => <option key={f} value={f}>{FAMILY_WORDS[f]}</option>)}
        </SelectField>
        <TextField label="Find" type="search" value={text} onChange={(e) => setText(e.target.value)} hint="Part number or name" className="w-72" />
      </div>
      <DataTable caption="Parts on the shelf at this site" columns={columns} data={rows} pageSize={100} empty={items.length ? 'No part matches the filter.' : 'No parts at this site yet.'} />
    </div>
  );
}
