import { useDraggable } from '@dnd-kit/core';
import { formatMinutes } from '../../../lib/format';
import { formatAtSite, siteTime } from '../../../lib/site-time';
import type { PlanVisit } from '../../../../shared/schemas/plan';

/** The name a visit's block goes by, for people and for tests: "Visit SM-07 Tue 8 Dec 09:00, Bay 1". */
export const visitName = (v: PlanVisit, timeZone: string) => `Visit ${v.fleetNumber} ${formatAtSite(v.start, timeZone, 'EEE d MMM HH:mm')}, ${v.bayName}`;

interface Props {
  visit: PlanVisit;
  timeZone: string;
  selected: boolean;
  canMove: boolean;
  onSelect: () => void;
}

export function VisitBlock({ visit: v, timeZone, selected, canMove, onSelect }: Props) {
  const { attributes, listeners, setNodeRef, transform, isDragging } = useDraggable({ id: v.id, disabled: !canMove });
  const safety = v.tasks.some((t) => t.safetyCritical);
  const minutes = v.tasks.reduce((s, t) => s + t.minutes, 0);
  return (
    <button
      ref={setNodeRef}
      type="button"
      {...attributes}
      {...listeners}
      aria-label={visitName(v, timeZone)}
      aria-pressed={selected}
      data-testid={`visit-${v.id}`}
      onClick={onSelect}
      style={transform ? { transform: `translate3d(${transform.x}px, ${transform.y}px, 0)` } : undefined}
      className={`flex w-full flex-col gap-0.5 rounded-card border-2 bg-paper-raised p-2 text-left text-sm ${
        selected ? 'border-accent ring-2 ring-accent' : safety ? 'border-state-stop' : 'border-ink-line'
      } ${isDragging ? 'relative z-20 shadow-lg' : ''} ${canMove ? 'cursor-grab touch-none' : ''}`}
    >
      <span className="num flex items-center justify-between gap-1 font-semibold">
        {siteTime(v.start, timeZone)}–{siteTime(v.end, timeZone)}
        {v.pinned && <span className="text-xs font-semibold text-ink-soft"><span aria-hidden>◉</span> Pinned</span>}
      </span>
      <span className="text-base font-bold">{v.fleetNumber}</span>
      <span className="text-ink-soft">{v.modelName}</span>
      <ul className="mt-1 flex flex-col gap-0.5">
        {v.tasks.map((t) => (
          <li key={t.id} className={t.safetyCritical ? 'font-semibold text-state-stop' : ''}>
            {t.safetyCritical && <span aria-hidden>⚠ </span>}
            {t.itemName} <span className="num whitespace-nowrap">· {formatMinutes(t.minutes)}</span>
            {t.safetyCritical && <span className="sr-only"> (safety-critical)</span>}
          </li>
        ))}
      </ul>
      <span className="num mt-1 text-xs text-ink-soft">
        {formatMinutes(minutes)} in all{safety && ' · safety-critical work'}
      </span>
    </button>
  );
}
