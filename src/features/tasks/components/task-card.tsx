import { useState } from 'react';
import { Link } from 'react-router-dom';
import { Button } from '../../../components/ui/button';
import { BikeStatusBadge } from '../../../components/ui/status-badge';
import { toast } from '../../../components/ui/toast';
import { hasDraft } from '../../../lib/use-draft';
import { formatDate, formatDaysLeft, formatMinutes } from '../../../lib/format';
import { BIKE_STATUSES, type BikeStatus } from '../../../../shared/schemas/bikes';
import { TASK_STATUS_LABELS, type Task } from '../../../../shared/schemas/tasks';
import { useStartTask } from '../api';
import { SignOffForm } from './sign-off-form';

const STATE_ICON: Record<Task['status'], string> = { open: '○', in_progress: '◆', done: '✓', cancelled: '–' };
const isBikeStatus = (s: string): s is BikeStatus => (BIKE_STATUSES as readonly string[]).includes(s);
const daysBetween = (from: string, to: string) => Math.round((Date.parse(to) - Date.parse(from)) / 86_400_000);

interface Props {
  task: Task;
  today: string;
  canWork: boolean;
  showAssignee: boolean;
  onReload: () => void;
}

export function TaskCard({ task, today, canWork, showAssignee, onReload }: Props) {
  const [signing, setSigning] = useState(() => hasDraft(`sign-off.${task.id}`));
  const start = useStartTask();
  const late = task.dueDate != null && task.dueDate < today;
  const open = task.status === 'open' || task.status === 'in_progress';
  return (
    <article id={`task-${task.id}`} aria-label={`${task.fleetNumber}: ${task.item}`} className={`flex flex-col gap-3 rounded-card border-2 bg-paper-raised p-5 ${late ? 'border-state-stop' : 'border-ink-line'}`}>
      <header className="flex flex-wrap items-baseline justify-between gap-2">
        <Link to={`/fleet/${task.bikeId}`} className="text-display font-bold text-accent underline-offset-4 hover:underline">{task.fleetNumber}</Link>
        <span className={`inline-flex items-center gap-1.5 rounded-full border-2 px-3 py-0.5 font-semibold ${task.status === 'in_progress' ? 'border-accent bg-accent-soft' : 'border-ink-line'}`}>
          <span aria-hidden>{STATE_ICON[task.status]}</span> {TASK_STATUS_LABELS[task.status]}
        </span>
      </header>
      <p className="text-reading font-semibold">
        {task.item}
        {task.safetyCritical && <span className="ml-2 text-base font-normal text-ink-soft">· safety-critical</span>}
      </p>
      <dl className="grid grid-cols-2 gap-x-4 gap-y-2 text-lg">
        <div>
          <dt className="text-sm text-ink-muted">Due</dt>
          <dd className={`num font-semibold ${late ? 'text-state-stop' : ''}`}>
            {late && <span aria-hidden>! </span>}
            {formatDate(task.dueDate)}
            {late && ` (${formatDaysLeft(-daysBetween(task.dueDate!, today))})`}
          </dd>
        </div>
        <div><dt className="text-sm text-ink-muted">Takes about</dt><dd className="num font-semibold">{formatMinutes(task.estimatedMinutes)}</dd></div>
        <div><dt className="text-sm text-ink-muted">Site</dt><dd>{task.siteName} · {task.modelName}</dd></div>
        <div><dt className="text-sm text-ink-muted">Bike</dt><dd>{isBikeStatus(task.bikeStatus) ? <BikeStatusBadge status={task.bikeStatus} /> : task.bikeStatus}</dd></div>
        {showAssignee && <div className="col-span-2"><dt className="text-sm text-ink-muted">Technician</dt><dd>{task.assignee?.name ?? 'Nobody yet'}</dd></div>}
      </dl>
      {canWork && open && !signing && (
        <div className="flex flex-wrap items-center gap-3">
          {task.status === 'open' && (
            <Button className="min-h-14 px-8 text-lg" disabled={start.isPending} onClick={() => start.mutate(task.id, { onSuccess: () => toast(`${task.fleetNumber} is in the workshop: ${task.item} on the bench.`) })}>
              {start.isPending ? 'Starting…' : 'Start: bike into the workshop'}
            </Button>
          )}
          {task.category === 'valves' ? (
            <p className="text-ink-soft">Closed from the valve card, with a reading for every valve.</p>
          ) : (
            <Button kind={task.status === 'open' ? 'secondary' : 'primary'} className="min-h-14 px-8 text-lg" onClick={() => setSigning(true)}>Sign off</Button>
          )}
        </div>
      )}
      {start.error && <p role="alert" className="text-state-stop">⚠ {start.error.message}</p>}
      {signing && open && <SignOffForm task={task} onCancel={() => setSigning(false)} onReload={() => { setSigning(false); onReload(); }} />}
    </article>
  );
}
