import { Link } from 'react-router-dom';
import type { Columns } from '../../../components/ui/data-table';
import { DueBadge } from '../../../components/ui/status-badge';
import { formatDate, formatDaysLeft, formatDistanceLeft, formatTrigger } from '../../../lib/format';
import type { DueItem } from '../../../../shared/schemas/due';
import { AssignSelect } from './assign-select';

const bike: Columns<DueItem>[number] = {
  id: 'bike',
  accessorKey: 'fleetNumber',
  header: 'Bike',
  cell: (c) => (
    <Link to={`/fleet/${c.row.original.bikeId}`} className="font-bold text-accent underline-offset-4 hover:underline">
      {c.row.original.fleetNumber}
    </Link>
  ),
};

const item: Columns<DueItem>[number] = {
  id: 'item',
  accessorKey: 'item',
  header: 'Work',
  cell: (c) => (
    <span>
      {c.row.original.item}
      {c.row.original.safetyCritical && <span className="ml-1 whitespace-nowrap text-sm text-ink-soft">· safety-critical</span>}
    </span>
  ),
};

const rest: Columns<DueItem> = [
  { id: 'due', accessorFn: (d) => d.dueDate ?? '9999', header: 'Due date', cell: (c) => <span className="num whitespace-nowrap">{formatDate(c.row.original.dueDate)}</span> },
  {
    id: 'left',
    accessorFn: (d) => d.remainingInUnit ?? Number.MAX_SAFE_INTEGER,
    header: 'Distance left',
    cell: (c) => <span className="num whitespace-nowrap">{formatDistanceLeft(c.row.original.remainingInUnit, c.row.original.odometerUnit)}</span>,
  },
  { id: 'trigger', accessorFn: (d) => d.trigger ?? '', header: 'Trigger', cell: (c) => formatTrigger(c.row.original.trigger, c.row.original.odometerUnit) },
  { id: 'assignee', accessorFn: (d) => d.assignee?.name ?? '', header: 'Technician', cell: (c) => <AssignSelect item={c.row.original} /> },
];

/** The week's sections: bike, work, when, how far, what makes it due, who does it. */
export const weekColumns: Columns<DueItem> = [bike, item, { id: 'site', accessorKey: 'siteName', header: 'Site' }, ...rest];

/** The full due list adds the state, the model and the days left. */
export const listColumns: Columns<DueItem> = [
  { id: 'status', accessorFn: (d) => ({ overdue: 0, soon: 1, ok: 2 })[d.status], header: 'State', cell: (c) => <DueBadge status={c.row.original.status} /> },
  bike,
  { id: 'model', accessorKey: 'modelName', header: 'Model' },
  { id: 'site', accessorKey: 'siteName', header: 'Site' },
  item,
  rest[0],
  { id: 'days', accessorFn: (d) => d.remainingDays ?? Number.MAX_SAFE_INTEGER, header: 'Days left', cell: (c) => <span className="num whitespace-nowrap">{formatDaysLeft(c.row.original.remainingDays)}</span> },
  ...rest.slice(1),
];
