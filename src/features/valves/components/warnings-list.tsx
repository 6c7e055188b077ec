import { Link } from 'react-router-dom';
import { Empty } from '../../../components/ui/states';
import type { ValveWarning } from '../api';

/** Valves on course to leave their spec before the next scheduled check, one line each. */
export function WarningsList({ items }: { items: ValveWarning[] }) {
  if (!items.length) return <Empty title="No valve is on course to leave its spec before its next check." />;
  return (
    <ul className="flex flex-col gap-2">
      {items.map((w) => (
        <li key={`${w.bikeId}-${w.valve}`} className="flex items-start gap-3 rounded-card border-2 border-state-stop bg-paper-raised px-3 py-1">
          <span aria-hidden className="inline-flex min-h-tap items-center font-black text-state-stop">⚠</span>
          <Link to={`/fleet/${w.bikeId}`} className="inline-flex min-h-tap min-w-16 items-center text-lg font-bold text-accent underline-offset-4 hover:underline">{w.fleetNumber}</Link>
          <p className="num flex-1 py-2">
            <span className="font-semibold">{w.valve}</span>
            : {w.message}
          </p>
        </li>
      ))}
    </ul>
  );
}
