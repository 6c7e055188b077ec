import { BIKE_STATUS_LABELS, type BikeStatus } from '../../../shared/schemas/bikes';

// Every state is said in words and a shape as well as a colour.
const BIKE: Record<BikeStatus, { icon: string; cls: string }> = {
  in_service: { icon: '●', cls: 'bg-state-ok-soft text-ink border-state-ok' },
  in_workshop: { icon: '◆', cls: 'bg-accent-soft text-ink border-accent' },
  out_of_service: { icon: '■', cls: 'bg-state-stop text-white border-state-stop' },
  retired: { icon: '○', cls: 'bg-paper-sunk text-ink-soft border-ink-line' },
};

export function BikeStatusBadge({ status }: { status: BikeStatus }) {
  const s = BIKE[status];
  return (
    <span className={`inline-flex items-center gap-1.5 whitespace-nowrap rounded-full border-2 px-2.5 py-0.5 text-sm font-semibold ${s.cls}`}>
      <span aria-hidden>{s.icon}</span>
      {BIKE_STATUS_LABELS[status]}
    </span>
  );
}

export type DueStatus = 'ok' | 'soon' | 'overdue';
export const DUE_LABELS: Record<DueStatus, string> = { ok: 'Fine', soon: 'Due soon', overdue: 'Overdue' };
const DUE: Record<DueStatus, { icon: string; cls: string }> = {
  ok: { icon: '✓', cls: 'bg-state-ok-soft text-ink border-state-ok' },
  soon: { icon: '◔', cls: 'bg-state-soon text-ink border-state-soon' },
  overdue: { icon: '!', cls: 'bg-state-stop text-white border-state-stop' },
};

export function DueBadge({ status }: { status: DueStatus }) {
  const s = DUE[status];
  return (
    <span className={`inline-flex items-center gap-1.5 whitespace-nowrap rounded-full border-2 px-2.5 py-0.5 text-sm font-semibold ${s.cls}`}>
      <span aria-hidden className="font-black">{s.icon}</span>
      {DUE_LABELS[status]}
    </span>
  );
}
