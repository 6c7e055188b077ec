import { DataTable, type Columns } from '../../../components/ui/data-table';
import { DueBadge } from '../../../components/ui/status-badge';
import { formatDate, formatDaysLeft, formatDistanceLeft, formatOdometer, formatRate, formatTrigger } from '../../../lib/format';
import { fromKm } from '../../../../shared/domain/units';
import type { BikeSummary } from '../../../../shared/schemas/bikes';
import type { DueItem } from '../../../../shared/schemas/due';

const STATUS_ORDER = { overdue: 0, soon: 1, ok: 2 } as const;

function columns(bike: BikeSummary): Columns<DueItem> {
  // Distances left are counted from the odometer as it reads now, so "due at" is in the instrument's own figures.
  const now = bike.latestOdometer ?? bike.inServiceOdometer;
  const unit = bike.odometerUnit;
  return [
    { id: 'status', accessorFn: (d) => STATUS_ORDER[d.status], header: 'State', cell: (c) => <DueBadge status={c.row.original.status} /> },
    {
      id: 'item',
      accessorKey: 'item',
      header: 'Work',
      cell: (c) => (
        <span className="font-semibold">
          {c.row.original.item}
          {c.row.original.safetyCritical && <span className="ml-1 block text-sm font-normal text-ink-soft">safety-critical</span>}
        </span>
      ),
    },
    { id: 'last', accessorFn: (d) => d.lastDoneDate ?? '', header: 'Last done', cell: (c) => <span className="num whitespace-nowrap">{formatDate(c.row.original.lastDoneDate)}</span> },
    {
      id: 'at',
      accessorFn: (d) => d.remainingInUnit ?? Number.MAX_SAFE_INTEGER,
      header: 'Due at',
      cell: (c) => <span className="num whitespace-nowrap">{c.row.original.remainingInUnit == null ? '—' : formatOdometer(now + c.row.original.remainingInUnit, unit)}</span>,
    },
    {
      id: 'by',
      accessorFn: (d) => d.dueByDate ?? d.dueDate ?? '9999',
      header: 'Due by date',
      cell: (c) => {
        const d = c.row.original;
        if (d.dueByDate) return <span className="num whitespace-nowrap">{formatDate(d.dueByDate)}</span>;
        return d.dueDate ? <span className="num whitespace-nowrap text-ink-soft">about {formatDate(d.dueDate)}</span> : '—';
      },
    },
    { id: 'left', accessorFn: (d) => d.remainingInUnit ?? Number.MAX_SAFE_INTEGER, header: `${unit} left`, cell: (c) => <span className="num whitespace-nowrap">{formatDistanceLeft(c.row.original.remainingInUnit, unit)}</span> },
    { id: 'days', accessorFn: (d) => d.remainingDays ?? Number.MAX_SAFE_INTEGER, header: 'Days left', cell: (c) => <span className="num whitespace-nowrap">{formatDaysLeft(c.row.original.remainingDays)}</span> },
    { id: 'trigger', accessorFn: (d) => d.trigger ?? '', header: 'Comes due', cell: (c) => formatTrigger(c.row.original.trigger, unit) },
    { id: 'who', accessorFn: (d) => d.assignee?.name ?? '', header: 'Technician', cell: (c) => c.row.original.assignee?.name ?? <span className="text-ink-muted">{c.row.original.taskId ? 'Nobody yet' : '—'}</span> },
  ];
}

/** Every service item of the bike: where it stands, when and at what reading it falls due, who has it. */
export function WhatIsDue({ bike, due }: { bike: BikeSummary; due: DueItem[] }) {
  const rate = due.find((d) => d.usageKmPerDay != null)?.usageKmPerDay;
  const unit = bike.odometerUnit;
  return (
    <section aria-labelledby="what-is-due" className="flex flex-col gap-2">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 id="what-is-due" className="text-xl font-bold">What is due</h2>
        <p className="num text-ink-soft">
          Ridden about <span className="font-semibold text-ink">{formatRate(rate == null ? null : fromKm(rate, unit), unit)}</span> lately
        </p>
      </div>
      <DataTable caption="What is due" columns={columns(bike)} data={due} pageSize={50} empty="No service plan covers this bike yet. A manager sets the plan for its model." />
      <p className="text-sm text-ink-muted">“About” dates are estimated from how much the bike is ridden; they move as the odometer does.</p>
    </section>
  );
}
