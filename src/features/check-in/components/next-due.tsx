import { Link } from 'react-router-dom';
import { DueBadge } from '../../../components/ui/status-badge';
import { formatDate, formatDistanceLeft } from '../../../lib/format';
import type { DueItem } from '../../../../shared/schemas/due';

const SHOWN = 5;

function left(d: DueItem) {
  if (d.remainingInUnit == null) return <span className="text-ink-soft">by date only</span>;
  return d.remainingInUnit < 0 ? formatDistanceLeft(d.remainingInUnit, d.odometerUnit) : `${formatDistanceLeft(d.remainingInUnit, d.odometerUnit)} left`;
}

/** The bike's next service items, soonest first, as the desk needs them: what, when, how far. */
export function NextDue({ bikeId, items }: { bikeId: string; items: DueItem[] }) {
  if (!items.length) return <p className="text-lg text-ink-soft">No service plan items for this bike yet.</p>;
  return (
    <div>
      <ul className="divide-y divide-ink-line rounded-card border-2 border-ink-line bg-paper-raised">
        {items.slice(0, SHOWN).map((d) => (
          <li key={d.itemId} className="grid grid-cols-[7.5rem_1fr] items-center gap-x-4 gap-y-1 px-4 py-3 sm:grid-cols-[7.5rem_1fr_auto_9rem]">
            <span><DueBadge status={d.status} /></span>
            <span className="text-lg font-semibold">
              {d.item}
              {d.safetyCritical && <span className="ml-2 whitespace-nowrap text-sm font-normal text-ink-soft">(safety-critical)</span>}
            </span>
            <span className="num col-start-2 text-lg sm:col-start-auto">
              <span className="sr-only">Due </span>
              {formatDate(d.dueDate)}
            </span>
            <span className="num col-start-2 text-lg sm:col-start-auto sm:text-right">{left(d)}</span>
          </li>
        ))}
      </ul>
      {items.length > SHOWN && (
        <Link to={`/fleet/${bikeId}`} className="mt-2 inline-flex min-h-tap items-center text-accent underline-offset-4 hover:underline">
          {items.length - SHOWN} more on the bike’s page
        </Link>
      )}
    </div>
  );
}
