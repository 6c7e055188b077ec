import { Link } from 'react-router-dom';
import { Empty } from '../../../components/ui/states';
import { formatKm } from '../../../lib/format';
import type { ValveWarning } from '../api';

/** Valves on course to leave their spec before the next scheduled check, one line each. */
export function WarningsList({ items }: { items: ValveWarning[] }) {
  if (!items.length) return <Empty title="No valve is on course to leave its spec before its next check." />;
  return (
    <ul className="flex flex-col gap-2">
      {items.map((w) => (
        <li key={`${w.bikeId}-${w.valve}`} className="flex flex-wrap items-baseline gap-x-3 gap-y-1 rounded-card border-2 border-state-stop bg-paper-raised p-3">
          <span aria-hidden className="font-black text-state-stop">⚠</span>
          <Link to={`/fleet/${w.bikeId}`} className="inline-flex min-h-tap items-center text-lg font-bold text-accent underline-offset-4 hover:underline">{w.fleetNumber}</Link>
          <span className="font-semibold">{w.valve}</span>
          <span className="num">{w.message}</span>
          {w.kmAtSpecMin != null && <span className="sr-only">Reaches the minimum near {formatKm(w.kmAtSpecMin)}.</span>}
        </li>
      ))}
    </ul>
  );
}
