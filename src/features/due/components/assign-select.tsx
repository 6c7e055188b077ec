import { createContext, useCallback, useContext, useMemo, useState, type ReactNode } from 'react';
import { useQuery } from '@tanstack/react-query';
import type { z } from 'zod';
import { toast } from '../../../components/ui/toast';
import { formatMinutes } from '../../../lib/format';
import { useMe } from '../../../lib/use-me';
import { canManageFleet } from '../../../../shared/domain/policies';
import type { DueItem } from '../../../../shared/schemas/due';
import type { AssigneeListSchema } from '../../../../shared/schemas/tasks';
import { dueQueries, useAssign } from '../api';

type Assignees = z.infer<typeof AssigneeListSchema>['items'];

interface Assigning {
  may: boolean;
  people?: Assignees;
  /** Tasks whose assignment is on its way to the server: their box waits. */
  pending: ReadonlySet<string>;
  assign: (item: DueItem, assigneeId: string | null) => void;
}

const AssignContext = createContext<Assigning | null>(null);

/**
 * Who may assign, the technicians and the assignments under way, read once for a whole list: a
 * list of hundreds of rows would otherwise hold as many subscriptions to the same data.
 */
export function AssignProvider({ children }: { children: ReactNode }) {
  const may = canManageFleet(useMe());
  const people = useQuery({ ...dueQueries.assignees(), enabled: may });
  const { mutateAsync } = useAssign();
  const [pending, setPending] = useState<ReadonlySet<string>>(() => new Set());
  const assign = useCallback(
    (item: DueItem, assigneeId: string | null) => {
      const taskId = item.taskId!;
      const name = people.data?.items.find((p) => p.id === assigneeId)?.name ?? 'nobody';
      setPending((p) => new Set(p).add(taskId));
      mutateAsync({ taskId, assigneeId })
        .then(
          () => toast(`${item.fleetNumber}, ${item.item}: assigned to ${name}.`),
          (err: Error) => toast(err.message),
        )
        .finally(() =>
          setPending((p) => {
            const next = new Set(p);
            next.delete(taskId);
            return next;
          }),
        );
    },
    [mutateAsync, people.data],
  );
  const value = useMemo(() => ({ may, people: people.data?.items, pending, assign }), [may, people.data, pending, assign]);
  return <AssignContext.Provider value={value}>{children}</AssignContext.Provider>;
}

/** Who does the work; a manager changes it here, choosing among the technicians of the bike's site. */
export function AssignSelect({ item }: { item: DueItem }) {
  const ctx = useContext(AssignContext);
  if (!ctx) throw new Error('AssignSelect needs an AssignProvider around the list it is in.');
  const { may, people, pending, assign } = ctx;
  if (!item.taskId) return <span className="text-ink-muted">No task raised yet</span>;
  if (!may) return <span>{item.assignee?.name ?? <span className="text-ink-muted">Nobody yet</span>}</span>;
  // The same box while the technicians load (held, showing who has it now), so no row changes size when they arrive.
  const here = people?.filter((p) => p.siteIds.includes(item.siteId)) ?? [];
  return (
    <select
      aria-label={`Technician for ${item.fleetNumber}, ${item.item}`}
      title="Open work already given to each technician is shown in brackets."
      className="min-h-tap w-64 max-w-full rounded-card border-2 border-ink-line bg-paper-raised px-2"
      value={item.assignee?.id ?? ''}
      disabled={pending.has(item.taskId) || !people}
      onChange={(e) => assign(item, e.target.value || null)}
    >
      <option value="">Nobody yet</option>
      {item.assignee && !here.some((p) => p.id === item.assignee!.id) && <option value={item.assignee.id}>{item.assignee.name}</option>}
      {here.map((p) => (
        <option key={p.id} value={p.id}>
          {p.name} ({formatMinutes(p.openMinutes)})
        </option>
      ))}
    </select>
  );
}
