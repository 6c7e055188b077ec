import { useQuery } from '@tanstack/react-query';
import { toast } from '../../../components/ui/toast';
import { formatMinutes } from '../../../lib/format';
import { useMe } from '../../../lib/use-me';
import { canManageFleet } from '../../../../shared/domain/policies';
import type { DueItem } from '../../../../shared/schemas/due';
import { dueQueries, useAssign } from '../api';

/** Who does the work; a manager changes it here, choosing among the technicians of the bike's site. */
export function AssignSelect({ item }: { item: DueItem }) {
  const me = useMe();
  const may = canManageFleet(me);
  const people = useQuery({ ...dueQueries.assignees(), enabled: may });
  const assign = useAssign();
  if (!item.taskId) return <span className="text-ink-muted">No task raised yet</span>;
  if (!may) return <span>{item.assignee?.name ?? <span className="text-ink-muted">Nobody yet</span>}</span>;
  // The same box while the technicians load (held, showing who has it now), so no row changes size when they arrive.
  const here = people.data?.items.filter((p) => p.siteIds.includes(item.siteId)) ?? [];
  return (
    <select
      aria-label={`Technician for ${item.fleetNumber}, ${item.item}`}
      title="Open work already given to each technician is shown in brackets."
      className="min-h-tap w-64 max-w-full rounded-card border-2 border-ink-line bg-paper-raised px-2"
      value={item.assignee?.id ?? ''}
      disabled={assign.isPending || !people.data}
      onChange={(e) => {
        const id = e.target.value || null;
        const name = here.find((p) => p.id === id)?.name ?? 'nobody';
        assign.mutate(
          { taskId: item.taskId!, assigneeId: id },
          { onSuccess: () => toast(`${item.fleetNumber}, ${item.item}: assigned to ${name}.`), onError: (err) => toast(err.message) },
        );
      }}
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
