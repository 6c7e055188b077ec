import { addDaysIso } from '../../../lib/format';
import { siteDay } from '../../../lib/site-time';
import type { PlanAnswer, PlanBooking, PlanVisit } from '../../../../shared/schemas/plan';

export type RowKind = 'bay' | 'technician';

export const BOARD_DAYS = 14;

export function boardDays(from: string, count = BOARD_DAYS): string[] {
  return Array.from({ length: count }, (_, i) => addDaysIso(from, i));
}

export const cellId = (rowId: string, day: string) => `${rowId}|${day}`;

export function parseCellId(id: string): { rowId: string; day: string } | null {
  const m = /^(.+)\|(\d{4}-\d{2}-\d{2})$/.exec(id);
  return m ? { rowId: m[1], day: m[2] } : null;
}

export const rowOf = (v: PlanVisit, kind: RowKind) => (kind === 'bay' ? v.bayId : v.technicianId);

/** Each visit in its row's day cell (the site's day of its start), earliest first. */
export function visitsByCell(visits: PlanVisit[], kind: RowKind, timeZone: string): Map<string, PlanVisit[]> {
  const cells = new Map<string, PlanVisit[]>();
  for (const v of visits) {
    const key = cellId(rowOf(v, kind), siteDay(v.start, timeZone));
    cells.set(key, [...(cells.get(key) ?? []), v]);
  }
  for (const list of cells.values()) list.sort((a, b) => a.start.localeCompare(b.start) || a.sequence - b.sequence);
  return cells;
}

/** When the visit's bike is needed: its own bookings, and its model's at its site (any bike of the model may be the one). */
export function bookingsForVisit(answer: PlanAnswer, v: PlanVisit): PlanBooking[] {
  return answer.bookings
    .filter((b) => b.bikeId === v.bikeId || (b.bikeId === null && b.siteId === v.siteId && b.modelName === v.modelName))
    .sort((a, b) => a.start.localeCompare(b.start));
}

/** The bookings that touch a site day: from their first day to their last, on the site's clock. */
export function bookingsOnDay(bookings: PlanBooking[], day: string, timeZone: string): PlanBooking[] {
  return bookings.filter((b) => siteDay(b.start, timeZone) <= day && day <= siteDay(Date.parse(b.end) - 1, timeZone));
}
