import { Link } from 'react-router-dom';
import { formatDate, formatOdometer } from '../../../lib/format';
import type { BikeSummary } from '../../../../shared/schemas/bikes';

/** Bikes out of service, each with the reason the desk gives a rider. */
export function GroundedList({ bikes }: { bikes: BikeSummary[] }) {
  if (!bikes.length) return <p className="rounded-card border-2 border-dashed border-ink-line p-4 text-ink-soft">✓ No bike is grounded.</p>;
  return (
    <ul className="divide-y divide-ink-line rounded-card border-2 border-state-stop bg-paper-raised">
      {bikes.map((b) => (
        <li key={b.id} className="flex flex-wrap items-baseline gap-x-4 gap-y-1 px-4 py-3">
          <span aria-hidden className="font-black text-state-stop">■</span>
          <Link to={`/fleet/${b.id}`} className="font-bold text-accent underline-offset-4 hover:underline">
            {b.fleetNumber}
          </Link>
          <span className="text-ink-soft">
            {b.model.name} · {b.site.name}
          </span>
          <span className="min-w-64 flex-1">{b.statusReason ?? 'No reason recorded.'}</span>
          <span className="num text-sm text-ink-soft">
            {formatOdometer(b.latestOdometer, b.odometerUnit)} on {formatDate(b.latestReadingDate)}
          </span>
        </li>
      ))}
    </ul>
  );
}
