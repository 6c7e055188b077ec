import type { ReactNode } from 'react';
import { useMemo } from 'react';
import { useQuery } from '@tanstack/react-query';
import { DataTable } from '../../../components/ui/data-table';
import { ErrorPanel, Loading, PageHeader, SafetyNote } from '../../../components/ui/states';
import { formatDate } from '../../../lib/format';
import { referenceQueries } from '../../../lib/reference-queries';
import { dueQueries } from '../api';
import { CalendarFeed } from '../components/calendar-feed';
import { weekColumns } from '../components/due-columns';
import { DueListPanel } from '../components/due-list-panel';
import { AssignProvider } from '../components/assign-select';
import { GroundedList } from '../components/grounded-list';
import { SiteSummary } from '../components/site-summary';
import { WeekSection } from '../components/week-section';

/** The manager's Monday: what is late, what comes this week, what stands in the yard. */
/**
 * `extra` is what other features add to the board (valve warnings), composed in src/app; the board
 * waits for it while `extraPending`, so that nothing already on screen is pushed down when it arrives.
 */
export function ThisWeekRoute({ extra, extraPending = false }: { extra?: ReactNode; extraPending?: boolean } = {}) {
  const week = useQuery(dueQueries.list({ within: 7 }));
  const bikes = useQuery(dueQueries.grounded());
  const sites = useQuery(referenceQueries.sites());
  const overdue = useMemo(() => week.data?.items.filter((d) => d.status === 'overdue') ?? [], [week.data]);
  const soon = useMemo(() => week.data?.items.filter((d) => d.status !== 'overdue') ?? [], [week.data]);
  const grounded = useMemo(() => bikes.data?.items ?? [], [bikes.data]);
  const knownItems = useMemo(() => [...new Set(week.data?.items.map((d) => d.item))], [week.data]);

  const error = week.error ?? bikes.error;
  return (
    <div className="flex flex-col gap-6">
      <PageHeader title="This week">
        {week.data && <p className="num self-center text-ink-soft">Today is {formatDate(week.data.today)}</p>}
      </PageHeader>
      {error ? (
        <ErrorPanel error={error} retry={() => { void week.refetch(); void bikes.refetch(); }} />
      ) : week.isPending || bikes.isPending || sites.isPending || extraPending ? (
        // Everything below waits too: content arriving above it would push it down the screen.
        <Loading what="this week’s work" />
      ) : (
        <AssignProvider>
          <SiteSummary sites={sites.data?.items ?? []} due={week.data!.items} bikes={grounded} />
          <WeekSection title="Overdue" icon="!" count={overdue.length} tone="stop">
            <DataTable caption="Overdue work" columns={weekColumns} data={overdue} pageSize={50} empty="✓ Nothing is overdue." />
          </WeekSection>
          <WeekSection title="Due within 7 days" icon="◔" count={soon.length} tone="soon">
            <DataTable caption="Due within 7 days" columns={weekColumns} data={soon} pageSize={50} empty="Nothing else falls due this week." />
          </WeekSection>
          <WeekSection title="Out of service" icon="■" count={grounded.length} tone="ink">
            <GroundedList bikes={grounded} />
          </WeekSection>
          {extra}
          <DueListPanel knownItems={knownItems} />
          <CalendarFeed />
          <SafetyNote />
        </AssignProvider>
      )}
    </div>
  );
}
