import { useState } from 'react';
import { Button } from '../../../components/ui/button';
import { TextField } from '../../../components/ui/field';
import { readWeeklyRule } from '../../../../shared/domain/shifts';
import type { CapacitySite } from '../../../../shared/schemas/capacity';
import { useAddTimeOff, useRemovePattern, useRemoveTimeOff } from '../api';
import { PatternEditor } from './pattern-editor';
import { Problem } from './problem';

type Technician = CapacitySite['technicians'][number];

const dates = (a: string, b: string | null) => (b ? (a === b ? a : `${a} to ${b}`) : `from ${a}`);

/** One technician: working patterns in words with an editor, and time off. */
export function TechnicianCard({ site, tech, today }: { site: CapacitySite; tech: Technician; today: string }) {
  const [editing, setEditing] = useState<string | 'new' | null>(null);
  const [off, setOff] = useState({ firstDay: today, lastDay: today, reason: '' });
  const removePattern = useRemovePattern();
  const addOff = useAddTimeOff();
  const removeOff = useRemoveTimeOff();
  return (
    <article aria-labelledby={`tech-${site.id}-${tech.id}`} className="rounded-card border-2 border-ink-line bg-paper-raised p-4">
      <h3 id={`tech-${site.id}-${tech.id}`} className="text-lg font-bold">
        {tech.name}
      </h3>
      <h4 className="mt-2 font-semibold">Working patterns</h4>
      {tech.patterns.length === 0 && <p className="text-ink-soft">No working pattern at {site.name}: no work is planned for {tech.name} here.</p>}
      <ul className="space-y-2">
        {tech.patterns.map((p) => (
          <li key={p.id}>
            <div className="flex flex-wrap items-center gap-2">
              <span className="flex-1">
                {p.label && <strong>{p.label}: </strong>}
                {p.words} <span className="tabular-nums text-ink-soft">({dates(p.startsOn, p.endsOn)})</span>
              </span>
              {readWeeklyRule(p.rrule) && (
                <Button kind="secondary" onClick={() => setEditing(p.id)} aria-label={`Change ${p.words}`}>
                  Change
                </Button>
              )}
              <Button kind="danger" disabled={removePattern.isPending} onClick={() => removePattern.mutate(p.id)} aria-label={`Remove ${p.words}`}>
                Remove
              </Button>
            </div>
            {editing === p.id && <PatternEditor siteId={site.id} userId={tech.id} today={today} pattern={p} onDone={() => setEditing(null)} />}
          </li>
        ))}
      </ul>
      <Problem error={removePattern.error} />
      {editing === 'new' ? (
        <PatternEditor siteId={site.id} userId={tech.id} today={today} onDone={() => setEditing(null)} />
      ) : (
        <Button kind="secondary" className="mt-2" onClick={() => setEditing('new')}>
          + Add a working pattern
        </Button>
      )}

      <h4 className="mt-4 font-semibold">Time off</h4>
      {tech.timeOff.length === 0 ? (
        <p className="text-ink-soft">None booked.</p>
      ) : (
        <ul className="space-y-2">
          {tech.timeOff.map((o) => (
            <li key={o.id} className="flex flex-wrap items-center gap-2">
              <span className="flex-1 tabular-nums">
                {dates(o.firstDay, o.lastDay)}
                {o.reason && ` · ${o.reason}`}
              </span>
              <Button kind="danger" disabled={removeOff.isPending} onClick={() => removeOff.mutate(o.id)} aria-label={`Remove time off ${dates(o.firstDay, o.lastDay)}`}>
                Remove
              </Button>
            </li>
          ))}
        </ul>
      )}
      <form
        className="mt-2 flex flex-wrap items-end gap-2"
        onSubmit={(e) => {
          e.preventDefault();
          addOff.mutate({ userId: tech.id, firstDay: off.firstDay, lastDay: off.lastDay, reason: off.reason.trim() || null });
        }}
      >
        <TextField label="First day" type="date" value={off.firstDay} onChange={(e) => setOff({ ...off, firstDay: e.target.value })} className="w-48" />
        <TextField label="Last day" type="date" value={off.lastDay} onChange={(e) => setOff({ ...off, lastDay: e.target.value })} className="w-48" />
        <TextField label="Reason (optional)" value={off.reason} maxLength={200} onChange={(e) => setOff({ ...off, reason: e.target.value })} className="w-56" />
        <Button type="submit" disabled={addOff.isPending}>
          Add time off
        </Button>
      </form>
      <Problem error={removeOff.error ?? addOff.error} />
    </article>
  );
}
