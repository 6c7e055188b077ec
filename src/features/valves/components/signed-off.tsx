import { Link } from 'react-router-dom';
import { useQuery } from '@tanstack/react-query';
import { Loading } from '../../../components/ui/states';
import { formatDate, formatOdometer } from '../../../lib/format';
import type { Task } from '../../../../shared/schemas/tasks';
import { valveQueries } from '../api';

/** After sign-off: when the valves are next due, counted from today's check. */
export function SignedOff({ task }: { task: Task }) {
  const q = useQuery(valveQueries.bikeDetail(task.bikeId));
  const due = q.data?.due.find((d) => d.category === 'valves');
  const bike = q.data?.bike;
  const now = bike?.latestOdometer ?? bike?.inServiceOdometer ?? 0;
  return (
    <section role="status" aria-labelledby="signed-off" className="flex flex-col gap-4 rounded-card border-4 border-state-ok bg-state-ok-soft p-6">
      <h1 id="signed-off" className="flex items-center gap-3 text-display font-bold">
        <span aria-hidden className="inline-flex h-12 w-12 items-center justify-center rounded-full bg-state-ok text-2xl text-white">✓</span>
        Signed off: {task.fleetNumber}, {task.item}
      </h1>
      {q.isPending && <Loading what="the next due date" />}
      {q.error && <p>The next due date could not be loaded; the bike’s page shows it.</p>}
      {q.data && !due && <p className="text-lg">No valve check is planned for this model; a manager sets the plan.</p>}
      {due && bike && (
        <p className="num text-reading">
          Next valve check:{' '}
          {due.remainingInUnit != null && <strong>at {formatOdometer(now + due.remainingInUnit, bike.odometerUnit)}</strong>}
          {due.remainingInUnit != null && (due.dueByDate || due.dueDate) && ' or '}
          {due.dueByDate ? <strong>by {formatDate(due.dueByDate)}</strong> : due.dueDate && <strong>about {formatDate(due.dueDate)}</strong>}
          {due.remainingInUnit != null && due.dueByDate && ', whichever comes first'}.
        </p>
      )}
      <div className="flex flex-wrap gap-3">
        <Link to="/tasks" className="inline-flex min-h-14 items-center rounded-card bg-accent px-6 text-lg font-semibold text-white hover:bg-accent-strong">← Back to tasks</Link>
        <Link to={`/fleet/${task.bikeId}`} className="inline-flex min-h-14 items-center rounded-card border-2 border-ink-line bg-paper-raised px-6 text-lg font-semibold">{task.fleetNumber}’s page</Link>
      </div>
    </section>
  );
}
