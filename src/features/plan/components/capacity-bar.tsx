import { formatMinutes } from '../../../lib/format';
import type { PlanCapacity } from '../../../../shared/schemas/plan';

/** A day's planned work against the technicians' time, in words and as a bar. */
export function CapacityBar({ day, capacity }: { day: string; capacity: PlanCapacity | undefined }) {
  if (!capacity || capacity.availableMinutes <= 0)
    return <p data-testid={`capacity-${day}`} className="text-xs text-ink-soft">{capacity?.plannedMinutes ? `${formatMinutes(capacity.plannedMinutes)} planned, nobody working` : 'Workshop closed or nobody working'}</p>;
  const { plannedMinutes: planned, availableMinutes: available } = capacity;
  const over = planned > available;
  const share = Math.min(1, planned / available);
  return (
    <div data-testid={`capacity-${day}`} className="flex flex-col gap-1">
      <span className={`num text-xs ${over ? 'font-semibold text-state-stop' : 'text-ink-soft'}`}>
        {over && <span aria-hidden>⚠ </span>}
        {formatMinutes(planned)} of {formatMinutes(available)} planned
        {over && ` (over by ${formatMinutes(planned - available)})`}
      </span>
      <span aria-hidden className="block h-2 w-full overflow-hidden rounded-full bg-paper-sunk">
        <span className={`block h-full ${over ? 'bg-state-stop' : share > 0.85 ? 'bg-state-soon' : 'bg-state-ok'}`} style={{ width: `${Math.round(share * 100)}%` }} />
      </span>
    </div>
  );
}
