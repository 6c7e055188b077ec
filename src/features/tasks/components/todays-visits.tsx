import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { Button } from '../../../components/ui/button';
import { formatMinutes } from '../../../lib/format';
import { referenceQueries } from '../../../lib/reference-queries';
import { siteTime } from '../../../lib/site-time';
import type { PlanVisit } from '../../../../shared/schemas/plan';
import type { Task } from '../../../../shared/schemas/tasks';
import { taskQueries } from '../api';

/** In the order the technician works them: by start, then by the plan's own sequence. */
export const inVisitOrder = (visits: PlanVisit[]) => [...visits].sort((a, b) => a.start.localeCompare(b.start) || a.sequence - b.sequence);

/** The technician's visits today, first on their list: when, where, which bike, and the work, each linked to its card below. */
export function TodaysVisits({ tasks }: { tasks: Task[] }) {
  const day = useQuery(taskQueries.myDay());
  const sites = useQuery(referenceQueries.sites());
  const zoneOf = (siteId: string) => sites.data?.items.find((s) => s.id === siteId)?.timeZone ?? Intl.DateTimeFormat().resolvedOptions().timeZone;
  const onList = new Set(tasks.map((t) => t.id));
  return (
    <section aria-labelledby="todays-visits" className="flex flex-col gap-3">
      <h2 id="todays-visits" className="text-xl font-bold">
        Today in the workshop {day.data && <span className="num font-normal text-ink-soft">({day.data.visits.length})</span>}
      </h2>
      {day.isPending || sites.isPending ? (
        <p role="status" className="text-ink-soft">Loading today’s visits…</p>
      ) : day.error ? (
        <div role="alert" className="flex flex-wrap items-center gap-3 text-state-stop">
          ⚠ Today’s visits could not be loaded: {day.error.message}
          <Button kind="secondary" onClick={() => day.refetch()}>Try again</Button>
        </div>
      ) : day.data.visits.length === 0 ? (
        <p className="text-ink-soft">No visits planned for you today.</p>
      ) : (
        <ol className="flex flex-col gap-3" aria-label="Today’s visits in order">
          {inVisitOrder(day.data.visits).map((v) => {
            const tz = zoneOf(v.siteId);
            return (
              <li key={v.id} data-testid={`my-visit-${v.id}`} className="rounded-card border-2 border-ink-line bg-paper-raised p-4">
                <p className="flex flex-wrap items-baseline gap-x-3 text-reading font-semibold">
                  <span className="num">{siteTime(v.start, tz)}–{siteTime(v.end, tz)}</span>
                  <span>{v.bayName}</span>
                  <Link to={`/fleet/${v.bikeId}`} className="font-bold text-accent underline-offset-4 hover:underline">{v.fleetNumber}</Link>
                  <span className="text-base font-normal text-ink-soft">{v.modelName}</span>
                </p>
                <ul className="mt-2 flex flex-col gap-1 text-lg">
                  {v.tasks.map((t) => (
                    <li key={t.id}>
                      {t.safetyCritical && <span aria-hidden>⚠ </span>}
                      {onList.has(t.id) ? (
                        <a href={`#task-${t.id}`} className="text-accent underline underline-offset-4">{t.itemName}</a>
                      ) : (
                        t.itemName
                      )}
                      <span className="num text-ink-soft"> · {formatMinutes(t.minutes)}</span>
                      {t.safetyCritical && <span className="text-base text-ink-soft"> · safety-critical</span>}
                    </li>
                  ))}
                </ul>
              </li>
            );
          })}
        </ol>
      )}
    </section>
  );
}
