import { useState } from 'react';
import { Link } from 'react-router-dom';
import { Button } from '../../../components/ui/button';
import { formatDate, formatMinutes } from '../../../lib/format';
import { formatAtSite, siteTime } from '../../../lib/site-time';
import type { PlanBooking, PlanVisit } from '../../../../shared/schemas/plan';
import type { BoardRow } from './board-grid';
import { MoveVisitForm } from './move-visit-form';

const DAY = 86_400_000;
/** Bookings this close to the visit are the ones that matter when moving it. */
const AROUND_DAYS = 3;

interface Props {
  visit: PlanVisit;
  timeZone: string;
  needed: PlanBooking[];
  bays: BoardRow[];
  technicians: BoardRow[];
  canMove: boolean;
  onMoved: (message: string) => void;
  onClose: () => void;
}

export function VisitDetail({ visit: v, timeZone, needed, bays, technicians, canMove, onMoved, onClose }: Props) {
  const [moving, setMoving] = useState(false);
  const at = (iso: string) => formatAtSite(iso, timeZone, 'EEE d MMM HH:mm');
  const from = Date.parse(v.start) - AROUND_DAYS * DAY;
  const to = Date.parse(v.end) + AROUND_DAYS * DAY;
  const around = needed.filter((b) => Date.parse(b.end) > from && Date.parse(b.start) < to);
  return (
    <section aria-labelledby="visit-detail-title" data-testid="visit-detail" className="flex flex-col gap-4 rounded-card border-2 border-ink-line bg-paper-raised p-4">
      <header className="flex flex-wrap items-start justify-between gap-2">
        <div>
          <h2 id="visit-detail-title" className="text-xl font-bold">
            <Link to={`/fleet/${v.bikeId}`} className="text-accent underline-offset-4 hover:underline">{v.fleetNumber}</Link> · {v.modelName}
          </h2>
          <p className="num text-lg">
            {at(v.start)}–{siteTime(v.end, timeZone)} · {v.bayName} · {v.technicianName}
          </p>
          <p className="text-ink-soft">
            Latest day: <span className="num font-semibold">{formatDate(v.latestDate)}</span>
            {v.pinned && <> · <span aria-hidden>◉</span> Pinned: a re-plan leaves it here</>}
          </p>
        </div>
        <div className="flex flex-wrap gap-2">
          {canMove && !moving && <Button onClick={() => setMoving(true)}>Move…</Button>}
          <Button kind="secondary" onClick={onClose}>Close</Button>
        </div>
      </header>
      {moving && (
        <MoveVisitForm key={v.id} visit={v} timeZone={timeZone} bays={bays} technicians={technicians} onCancel={() => setMoving(false)} onMoved={(m) => { setMoving(false); onMoved(m); }} />
      )}
      <div>
        <h3 className="font-bold">Work in this visit</h3>
        <ul className="mt-1 divide-y divide-ink-line">
          {v.tasks.map((t) => (
            <li key={t.id} className="flex flex-wrap justify-between gap-2 py-1.5">
              <span className={t.safetyCritical ? 'font-semibold text-state-stop' : ''}>
                {t.safetyCritical && <span aria-hidden>⚠ </span>}
                {t.itemName}
                {t.safetyCritical && ' (safety-critical)'}
              </span>
              <span className="num text-ink-soft">due {formatDate(t.dueDate)} · {formatMinutes(t.minutes)}</span>
            </li>
          ))}
        </ul>
      </div>
      <div>
        <h3 className="font-bold">Why it stands here</h3>
        {v.why.length ? (
          <ul className="mt-1 list-disc pl-5">{v.why.map((w, i) => <li key={i}>{w}</li>)}</ul>
        ) : (
          <p className="text-ink-soft">No reasons given.</p>
        )}
      </div>
      <div>
        <h3 className="font-bold">When the bike is needed</h3>
        {around.length ? (
          <ul className="mt-1 flex flex-col gap-1" aria-label={`Bookings around the visit of ${v.fleetNumber}`}>
            {around.map((b) => (
              <li key={b.bookingId} className="num">
                <span aria-hidden>◔ </span>
                {at(b.start)} – {at(b.end)}: {b.kind === 'hire' ? 'hire' : 'lesson'} “{b.title}”
                {b.bikeId === null ? ` (${b.quantity} × ${b.modelName} at the site)` : ' (this bike)'}
              </li>
            ))}
          </ul>
        ) : (
          <p className="text-ink-soft">No hires or lessons within {AROUND_DAYS} days of this visit.</p>
        )}
      </div>
    </section>
  );
}
