import { useQuery } from '@tanstack/react-query';
import { formatAtSite } from '../../../lib/site-time';
import type { NextVisit } from '../../../../shared/schemas/plan';
import { checkInQueries } from '../api';

/** The bike's next visit to the workshop within two days, if the plan has one. */
export function useNextVisit(bikeId: string, siteId: string) {
  const q = useQuery(checkInQueries.nextVisits(siteId));
  const visit = q.data?.items.filter((v) => v.bikeId === bikeId).sort((a, b) => a.start.localeCompare(b.start))[0] ?? null;
  return { visit, error: q.error };
}

const clock = (v: NextVisit) => formatAtSite(v.start, v.siteTimeZone, 'HH:mm');

/** What the desk is asked before a bike planned into the workshop today goes out. */
export const handOutQuestion = (fleetNumber: string, v: NextVisit) => `${fleetNumber} is planned into ${v.bayName} today at ${clock(v)}. Hand it out anyway?`;

/** What the desk is told once the reading is saved, by their answer. */
export const handOutOutcome = (fleetNumber: string, v: NextVisit, goesOut: boolean) =>
  goesOut
    ? `${fleetNumber} goes out: tell the workshop it will miss its visit in ${v.bayName} at ${clock(v)}.`
    : `Keep ${fleetNumber} at the site: it is due in ${v.bayName} at ${clock(v)}.`;

export function WorkshopNotice({ visit, error }: { visit: NextVisit | null; error: Error | null }) {
  if (error) return <p className="text-ink-soft">The workshop plan could not be checked: {error.message}</p>;
  if (!visit) return null;
  const when = formatAtSite(visit.start, visit.siteTimeZone, 'EEE HH:mm');
  return visit.today ? (
    <p role="alert" data-testid="workshop-notice" className="rounded-card border-4 border-state-soon bg-state-soon-soft p-4 text-lg font-semibold">
      <span aria-hidden>◔ </span>Due in the workshop today: {clock(visit)}, {visit.bayName}. You are asked before it goes out.
    </p>
  ) : (
    <p data-testid="workshop-notice" className="rounded-card border-2 border-ink-line bg-paper-raised p-3 text-lg">
      <span aria-hidden>◔ </span>Due in the workshop: <span className="num font-semibold">{when}</span>, {visit.bayName}
    </p>
  );
}
