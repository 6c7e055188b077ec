import { DataTable, type Columns } from '../../../components/ui/data-table';
import { formatDateTime } from '../../../lib/format';
import type { OutboxItem } from '../api';

const STATE: Record<OutboxItem['status'], { label: string; icon: string; cls: string }> = {
  pending: { label: 'Waiting', icon: '◔', cls: 'border-state-soon bg-state-soon-soft' },
  sent: { label: 'Sent', icon: '✓', cls: 'border-state-ok bg-state-ok-soft' },
  failed: { label: 'Gave up', icon: '■', cls: 'border-state-stop bg-state-stop text-white' },
};

const columns: Columns<OutboxItem> = [
  {
    id: 'status',
    accessorKey: 'status',
    header: 'State',
    cell: (c) => {
      const s = STATE[c.row.original.status];
      return (
        <span className={`inline-flex items-center gap-1.5 whitespace-nowrap rounded-full border-2 px-2.5 py-0.5 text-sm font-semibold ${s.cls}`}>
          <span aria-hidden>{s.icon}</span>
          {s.label}
        </span>
      );
    },
  },
  { id: 'to', accessorKey: 'to', header: 'To' },
  { id: 'subject', accessorKey: 'subject', header: 'Subject' },
  { id: 'attempts', accessorKey: 'attempts', header: 'Attempts', cell: (c) => <span className="num">{c.row.original.attempts}</span> },
  {
    id: 'when',
    accessorFn: (m) => m.sentAt ?? m.nextAttemptAt,
    header: 'Sent, or next try',
    cell: (c) => {
      const m = c.row.original;
      if (m.sentAt) return <span className="num">{formatDateTime(m.sentAt)}</span>;
      return m.status === 'failed' ? <span className="text-ink-muted">no more tries</span> : <span className="num">next try {formatDateTime(m.nextAttemptAt)}</span>;
    },
  },
  { id: 'error', accessorFn: (m) => m.lastError ?? '', header: 'Last error', cell: (c) => <span className="text-sm">{c.row.original.lastError ?? '—'}</span> },
];

export function OutboxTable({ items }: { items: OutboxItem[] }) {
  return <DataTable caption="Outbox" columns={columns} data={items} pageSize={25} empty="The outbox is empty: nothing has been sent yet." />;
}
