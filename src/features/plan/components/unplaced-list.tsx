import { Link } from 'react-router-dom';
import { formatDate } from '../../../lib/format';
import type { PlanUnplaced } from '../../../../shared/schemas/plan';

/** Work the plan could not fit, with why and what would let it in. */
export function UnplacedList({ items }: { items: PlanUnplaced[] }) {
  return (
    <section aria-labelledby="unplaced-title" data-testid="unplaced" className="flex flex-col gap-3 rounded-card border-2 border-ink-line bg-paper-raised p-4">
      <h2 id="unplaced-title" className="text-xl font-bold">
        Not placed yet <span className="num font-normal text-ink-soft">({items.length})</span>
      </h2>
      {items.length === 0 ? (
        <p className="text-ink-soft">✓ Every due task has a visit.</p>
      ) : (
        <ul className="flex flex-col gap-3">
          {items.map((u) => (
            <li key={u.taskId} className="border-l-4 border-state-soon pl-3">
              <p className="font-semibold">
                <Link to={`/fleet/${u.bikeId}`} className="text-accent underline underline-offset-4">{u.fleetNumber}</Link> · {u.itemName}
              </p>
              <p className="num text-sm text-ink-soft">Due {formatDate(u.dueDate)}</p>
              <p><span className="font-semibold">Why:</span> {u.reason}</p>
              <p><span className="font-semibold">What would help:</span> {u.remedy}</p>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
