import { DndContext, KeyboardSensor, PointerSensor, useDroppable, useSensor, useSensors, type Announcements, type DragEndEvent } from '@dnd-kit/core';
import type { ReactNode } from 'react';
import { formatDay, siteDay, siteTime } from '../../../lib/site-time';
import type { PlanAnswer, PlanBooking, PlanVisit } from '../../../../shared/schemas/plan';
import { bookingsOnDay, cellId, parseCellId, rowOf, visitsByCell, type RowKind } from './board-layout';
import { CapacityBar } from './capacity-bar';
import { VisitBlock, visitName } from './visit-block';

export interface BoardRow {
  id: string;
  name: string;
}

interface Props {
  answer: PlanAnswer;
  siteId: string;
  timeZone: string;
  days: string[];
  kind: RowKind;
  rows: BoardRow[];
  selected: PlanVisit | null;
  /** The selected visit's bike is needed at these times (its own bookings and its model's). */
  needed: PlanBooking[];
  canMove: boolean;
  onSelect: (v: PlanVisit) => void;
  onDrop: (v: PlanVisit, target: { rowId: string; day: string }) => void;
}

const instructions = {
  draggable:
    'To move a visit with the keyboard, press Space to pick it up, the arrow keys to carry it to another day or row, Space to drop it, Escape to put it back. Move visit in its details does the same with a form.',
};

function DropCell({ id, label, disabled, children }: { id: string; label: string; disabled: boolean; children: ReactNode }) {
  const { setNodeRef, isOver } = useDroppable({ id, disabled, data: { label } });
  return (
    <td ref={setNodeRef} data-testid={`cell-${id}`} className={`min-w-44 border border-ink-line p-1.5 align-top ${isOver ? 'bg-accent-soft' : ''}`}>
      <div className="flex min-h-16 flex-col gap-1.5">{children}</div>
    </td>
  );
}

export function BoardGrid({ answer, siteId, timeZone, days, kind, rows, selected, needed, canMove, onSelect, onDrop }: Props) {
  const sensors = useSensors(
    // A short travel before a drag starts, so a tap still selects the visit.
    useSensor(PointerSensor, { activationConstraint: { distance: 8 } }),
    useSensor(KeyboardSensor, { keyboardCodes: { start: ['Space'], cancel: ['Escape'], end: ['Space'] } }),
  );
  const visits = answer.visits.filter((v) => v.siteId === siteId);
  const cells = visitsByCell(visits, kind, timeZone);
  const byId = new Map(visits.map((v) => [v.id, v]));
  const rowName = new Map(rows.map((r) => [r.id, r.name]));
  const cellLabel = (id: string | number | undefined) => {
    const c = id === undefined ? null : parseCellId(String(id));
    return c ? `${rowName.get(c.rowId) ?? 'this row'} on ${formatDay(c.day)}` : 'no cell';
  };
  const nameOf = (id: string | number) => {
    const v = byId.get(String(id));
    return v ? visitName(v, timeZone) : 'the visit';
  };
  const announcements: Announcements = {
    onDragStart: ({ active }) => `Picked up ${nameOf(active.id)}.`,
    onDragOver: ({ active, over }) => `${nameOf(active.id)} is over ${cellLabel(over?.id)}.`,
    onDragEnd: ({ active, over }) => (over ? `${nameOf(active.id)} dropped on ${cellLabel(over.id)}.` : `${nameOf(active.id)} put back.`),
    onDragCancel: ({ active }) => `Moving ${nameOf(active.id)} cancelled; it stays where it was.`,
  };
  const onDragEnd = ({ active, over }: DragEndEvent) => {
    const v = byId.get(String(active.id));
    const target = over ? parseCellId(String(over.id)) : null;
    if (!v || !target) return;
    // Dropped back where it stands: nothing to ask the server.
    if (target.rowId === rowOf(v, kind) && target.day === siteDay(v.start, timeZone)) return;
    onDrop(v, target);
  };

  return (
    <DndContext sensors={sensors} onDragEnd={onDragEnd} accessibility={{ announcements, screenReaderInstructions: instructions }}>
      <div className="overflow-x-auto rounded-card border-2 border-ink-line bg-paper" data-testid="plan-board">
        <table className="border-collapse">
          <caption className="sr-only">Visits by {kind === 'bay' ? 'bay' : 'technician'} and day</caption>
          <thead>
            <tr>
              <th scope="col" className="sticky left-0 z-10 min-w-32 border border-ink-line bg-paper-sunk p-2 text-left">{kind === 'bay' ? 'Bay' : 'Technician'}</th>
              {days.map((d) => {
                const onDay = selected ? bookingsOnDay(needed, d, timeZone) : [];
                return (
                  <th key={d} scope="col" className="min-w-44 border border-ink-line bg-paper-sunk p-2 text-left align-top font-normal">
                    <span className="block font-bold">{formatDay(d)}</span>
                    <CapacityBar day={d} capacity={answer.capacity.find((c) => c.siteId === siteId && c.date === d)} />
                    {onDay.length > 0 && (
                      <ul data-testid={`needed-${d}`} aria-label={`${selected!.fleetNumber} needed on ${formatDay(d)}`} className="mt-1 flex flex-col gap-0.5">
                        {onDay.map((b) => (
                          <li key={b.bookingId} className="rounded bg-state-soon-soft px-1.5 py-0.5 text-xs">
                            <span aria-hidden>◔ </span>
                            <span className="num">{siteTime(b.start, timeZone)}–{siteTime(b.end, timeZone)}</span> {b.kind === 'hire' ? 'Hire' : 'Lesson'}: {b.title}
                            {b.bikeId === null && ` (${b.quantity} × ${b.modelName})`}
                          </li>
                        ))}
                      </ul>
                    )}
                  </th>
                );
              })}
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <tr key={r.id}>
                <th scope="row" className="sticky left-0 z-10 border border-ink-line bg-paper-raised p-2 text-left align-top">{r.name}</th>
                {days.map((d) => {
                  const id = cellId(r.id, d);
                  return (
                    <DropCell key={d} id={id} label={cellLabel(id)} disabled={!canMove}>
                      {(cells.get(id) ?? []).map((v) => (
                        <VisitBlock key={v.id} visit={v} timeZone={timeZone} selected={selected?.id === v.id} canMove={canMove} onSelect={() => onSelect(v)} />
                      ))}
                    </DropCell>
                  );
                })}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </DndContext>
  );
}
