import { Link } from 'react-router-dom';
import { Button } from '../../../components/ui/button';
import { ToneBadge } from '../../../components/ui/tone-badge';
import { formatDate, formatOdometer } from '../../../lib/format';
import { TASK_STATUS_LABELS } from '../../../../shared/schemas/tasks';
import type { ValveCard } from '../../../../shared/schemas/valves';
import { useStartValveTask } from '../api';

const ADJUSTER_WORDS: Record<ValveCard['adjuster'], string> = {
  'shim-under-bucket': 'shim under bucket',
  'screw-and-locknut': 'screw and locknut',
};

/** Which bike, which task, and the one action that comes before any reading: start. */
export function CardHeader({ card, canWork }: { card: ValveCard; canWork: boolean }) {
  const { task } = card;
  const start = useStartValveTask(task.id);
  return (
    <header className="flex flex-col gap-3">
      <Link to="/tasks" className="text-accent underline-offset-4 hover:underline">← Tasks</Link>
      <div className="flex flex-wrap items-center gap-3">
        <h1 className="text-display font-bold">
          <Link to={`/fleet/${task.bikeId}`} className="text-accent underline-offset-4 hover:underline">{task.fleetNumber}</Link>
          <span className="font-semibold"> · {task.item}</span>
        </h1>
        <ToneBadge tone={task.status === 'in_progress' ? 'info' : 'neutral'} icon={task.status === 'in_progress' ? '◆' : task.status === 'done' ? '✓' : '○'}>
          {TASK_STATUS_LABELS[task.status]}
        </ToneBadge>
      </div>
      <dl className="grid gap-3 rounded-card border-2 border-ink-line bg-paper-raised p-4 sm:grid-cols-2 lg:grid-cols-4">
        <Fact label="Model" value={`${task.modelName} (${ADJUSTER_WORDS[card.adjuster]})`} />
        <Fact label="Odometer now" value={formatOdometer(card.latestOdometer, card.odometerUnit)} big />
        <Fact label="Site" value={task.siteName} />
        <Fact label="Due" value={formatDate(task.dueDate)} />
      </dl>
      {canWork && task.status === 'open' && (
        <div className="flex flex-wrap items-center gap-3">
          <Button className="min-h-14 px-8 text-lg" disabled={start.isPending} onClick={() => start.mutate()}>
            {start.isPending ? 'Starting…' : 'Start: bike into the workshop'}
          </Button>
          <p className="text-ink-soft">The bike shows as in the workshop until the card is signed off.</p>
        </div>
      )}
      {start.error && <p role="alert" className="font-medium text-state-stop">⚠ {start.error.message}</p>}
    </header>
  );
}

function Fact({ label, value, big }: { label: string; value: string; big?: boolean }) {
  return (
    <div>
      <dt className="text-sm text-ink-muted">{label}</dt>
      <dd className={`num font-semibold ${big ? 'text-reading' : 'text-lg'}`}>{value}</dd>
    </div>
  );
}
