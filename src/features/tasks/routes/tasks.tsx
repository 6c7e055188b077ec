import { useSearchParams } from 'react-router-dom';
import { useQuery } from '@tanstack/react-query';
import { Empty, ErrorPanel, Loading, PageHeader, SafetyNote } from '../../../components/ui/states';
import { todayIso } from '../../../lib/format';
import { useMe } from '../../../lib/use-me';
import { taskQueries } from '../api';
import { groupTasks } from '../components/group-tasks';
import { TaskCard } from '../components/task-card';
import { TodaysVisits } from '../components/todays-visits';
import { WhoseToggle } from '../components/whose-toggle';

/** The technician's bench list; a manager sees every open task at their sites. */
export function TasksRoute() {
  const me = useMe();
  const [params, setParams] = useSearchParams();
  const isTech = me.role === 'technician';
  const mine = isTech && params.get('whose') !== 'all';
  const q = useQuery(taskQueries.list({ mine: mine ? '1' : undefined, status: 'active' }));
  const today = todayIso();
  const canWork = me.role === 'technician' || me.role === 'manager';
  return (
    <div className="flex flex-col gap-6">
      <PageHeader title={mine ? 'My tasks' : 'Tasks'}>
        {isTech && <WhoseToggle mine={mine} onChange={(m) => setParams(m ? {} : { whose: 'all' }, { replace: true })} />}
      </PageHeader>
      {mine && q.data && <TodaysVisits tasks={q.data.items} />}
      {q.isPending ? (
        <Loading what="tasks" />
      ) : q.error ? (
        <ErrorPanel error={q.error} retry={() => q.refetch()} />
      ) : q.data.items.length === 0 ? (
        <Empty title={mine ? 'Nothing on your list' : 'No open tasks'}>
          {mine ? 'When a manager gives you work, or the daily scan raises it, it shows here.' : 'The daily scan raises tasks as service work falls due.'}
        </Empty>
      ) : (
        groupTasks(q.data.items, today).map((g) => (
          <section key={g.key} aria-labelledby={`group-${g.key}`} className="flex flex-col gap-3">
            <h2 id={`group-${g.key}`} className="text-xl font-bold">
              {g.title} <span className="num font-normal text-ink-soft">({g.tasks.length})</span>
            </h2>
            {g.tasks.length === 0 ? (
              <p className="text-ink-soft">Nothing here.</p>
            ) : (
              <div className="grid gap-4 lg:grid-cols-2">
                {g.tasks.map((t) => (
                  <TaskCard key={t.id} task={t} today={today} canWork={canWork} showAssignee={!mine} onReload={() => q.refetch()} />
                ))}
              </div>
            )}
          </section>
        ))
      )}
      <SafetyNote />
    </div>
  );
}
