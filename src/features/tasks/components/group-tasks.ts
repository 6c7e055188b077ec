import { addDaysIso } from '../../../lib/format';
import type { Task } from '../../../../shared/schemas/tasks';

export interface TaskGroup {
  key: 'now' | 'week' | 'later';
  title: string;
  tasks: Task[];
}

/** Today and overdue, the next seven days, and everything after (or undated). */
export function groupTasks(tasks: Task[], today: string): TaskGroup[] {
  const weekEnd = addDaysIso(today, 7);
  const groups: TaskGroup[] = [
    { key: 'now', title: 'Today and overdue', tasks: [] },
    { key: 'week', title: 'This week', tasks: [] },
    { key: 'later', title: 'Later', tasks: [] },
  ];
  // A stable order, so cards do not swap places when the list refreshes.
  const sorted = [...tasks].sort((a, b) => (a.dueDate ?? '9999').localeCompare(b.dueDate ?? '9999') || a.fleetNumber.localeCompare(b.fleetNumber, 'en', { numeric: true }) || a.item.localeCompare(b.item));
  for (const t of sorted) {
    // Work already on the bench belongs to today, whatever its date.
    const g = t.status === 'in_progress' || (t.dueDate && t.dueDate <= today) ? 0 : t.dueDate && t.dueDate <= weekEnd ? 1 : 2;
    groups[g].tasks.push(t);
  }
  return groups;
}
