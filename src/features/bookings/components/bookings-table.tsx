import { DataTable, type Columns } from '../../../components/ui/data-table';
import { Button } from '../../../components/ui/button';
import { formatInZone } from '../../../../shared/domain/dates';
import type { Booking } from '../../../../shared/schemas/bookings';

const when = (b: Booking) => {
  const o = b.occurrences[0];
  const start = formatInZone(new Date(o.start), b.timeZone, 'EEE d MMM HH:mm');
  const sameDay = formatInZone(new Date(o.start), b.timeZone, 'yyyy-MM-dd') === formatInZone(new Date(o.end), b.timeZone, 'yyyy-MM-dd');
  return `${start}–${formatInZone(new Date(o.end), b.timeZone, sameDay ? 'HH:mm' : 'EEE d MMM HH:mm')}`;
};
export const bikesOf = (b: Booking) => (b.fleetNumber ? `${b.fleetNumber} (${b.modelName})` : `${b.quantity} × ${b.modelName}`);

interface Props {
  items: Booking[];
  canDelete: boolean;
  onDelete: (b: Booking) => void;
  deleting?: string | null;
}

/** The bookings in the range, by their first time in it, in each site's own time. */
export function BookingsTable({ items, canDelete, onDelete, deleting }: Props) {
  const columns: Columns<Booking> = [
    { id: 'when', accessorFn: (b) => b.occurrences[0]?.start ?? '', header: 'When (site time)', cell: (c) => <span className="num whitespace-nowrap">{when(c.row.original)}</span> },
    { id: 'site', accessorKey: 'siteName', header: 'Site' },
    { id: 'bikes', accessorFn: bikesOf, header: 'Bikes', cell: (c) => <span className="num">{bikesOf(c.row.original)}</span> },
    { id: 'kind', accessorKey: 'kind', header: 'Kind', cell: (c) => (c.row.original.kind === 'hire' ? 'Hire' : 'Lesson') },
    { id: 'title', accessorKey: 'title', header: 'Title', cell: (c) => c.row.original.title || '—' },
    {
      id: 'repeat', accessorFn: (b) => b.ruleText ?? '', header: 'Repeats',
      cell: (c) => (c.row.original.ruleText ? <span>{c.row.original.ruleText} <span className="num text-ink-soft">({c.row.original.occurrences.length} in range)</span></span> : 'Once'),
    },
    {
      id: 'source', accessorFn: (b) => b.feedName ?? b.source, header: 'From', enableSorting: false,
      cell: (c) => {
        const b = c.row.original;
        if (b.source === 'feed') return <span>Feed “{b.feedName}”: change it in that calendar</span>;
        return canDelete ? (
          <Button kind="secondary" onClick={() => onDelete(b)} disabled={deleting === b.id} aria-label={`Delete booking ${bikesOf(b)} ${when(b)}`}>
            {deleting === b.id ? 'Deleting…' : 'Delete'}
          </Button>
        ) : b.source === 'csv' ? 'Imported' : 'Added here';
      },
    },
  ];
  return <DataTable columns={columns} data={items} caption="Bookings in the chosen dates" initialSort={[{ id: 'when', desc: false }]} />;
}
