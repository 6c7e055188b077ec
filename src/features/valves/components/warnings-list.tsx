import { useState } from 'react';
import { Link } from 'react-router-dom';
import { Empty } from '../../../components/ui/states';
import type { ValveWarning } from '../api';

/** How many lines show before "Show all": a long list is read a screenful at a time. */
export const WARNINGS_SHOWN = 12;

/** Valves on course to leave their spec before the next scheduled check, one line each. */
export function WarningsList({ items, shown = WARNINGS_SHOWN }: { items: ValveWarning[]; shown?: number }) {
  const [all, setAll] = useState(false);
  if (!items.length) return <Empty title="No valve is on course to leave its spec before its next check." />;
  const visible = all ? items : items.slice(0, shown);
  return (
    <div className="flex flex-col gap-2">
      <ul className="flex flex-col gap-2">
        {visible.map((w) => (
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
      {items.length > visible.length && (
        <button type="button" onClick={() => setAll(true)} className="min-h-tap self-start rounded-card border-2 border-ink-line bg-paper-raised px-4 font-semibold">
          Show all {items.length.toLocaleString('en-GB')} valve warnings
        </button>
      )}
    </div>
  );
}
