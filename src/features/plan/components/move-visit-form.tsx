import { useState, type FormEvent } from 'react';
import { Button } from '../../../components/ui/button';
import { SelectField, TextField } from '../../../components/ui/field';
import { formatAtSite, siteDay, siteInstant, siteTime } from '../../../lib/site-time';
import { VisitMoveSchema, type PlanVisit } from '../../../../shared/schemas/plan';
import { useMoveVisit } from '../api';
import type { BoardRow } from './board-grid';

interface Props {
  visit: PlanVisit;
  timeZone: string;
  bays: BoardRow[];
  technicians: BoardRow[];
  onMoved: (message: string) => void;
  onCancel: () => void;
}

/** Moving a visit without dragging: for the keyboard and for a small tablet. */
export function MoveVisitForm({ visit, timeZone, bays, technicians, onMoved, onCancel }: Props) {
  const [day, setDay] = useState(() => siteDay(visit.start, timeZone));
  const [time, setTime] = useState(() => siteTime(visit.start, timeZone));
  const [bayId, setBayId] = useState(visit.bayId);
  const [technicianId, setTechnicianId] = useState(visit.technicianId);
  const [problem, setProblem] = useState<string | null>(null);
  const move = useMoveVisit();

  const submit = (e: FormEvent) => {
    e.preventDefault();
    move.reset();
    let start: string;
    try {
      start = siteInstant(day, time, timeZone);
    } catch (err) {
      return setProblem((err as Error).message);
    }
    const parsed = VisitMoveSchema.safeParse({ start, bayId, technicianId });
    if (!parsed.success) return setProblem(parsed.error.issues.map((i) => i.message).join(' '));
    setProblem(null);
    const bay = bays.find((b) => b.id === bayId)?.name ?? visit.bayName;
    move.mutate(
      { id: visit.id, move: parsed.data },
      { onSuccess: () => onMoved(`${visit.fleetNumber} moved to ${formatAtSite(start, timeZone, 'EEE d MMM HH:mm')}, ${bay}.`) },
    );
  };

  const refusal = problem ?? move.error?.message;
  return (
    <form onSubmit={submit} noValidate aria-label={`Move visit ${visit.fleetNumber}`} className="flex flex-col gap-3 rounded-card border-2 border-accent bg-paper-raised p-4">
      <h3 className="text-lg font-bold">Move visit</h3>
      <p className="text-sm text-ink-soft">Times are the site’s clock ({timeZone}). A moved visit is pinned: a re-plan leaves it where you put it.</p>
      <div className="grid gap-3 sm:grid-cols-2">
        <TextField label="Day" type="date" required value={day} onChange={(e) => setDay(e.target.value)} />
        <TextField label="Start time" type="time" required step={300} value={time} onChange={(e) => setTime(e.target.value)} />
        <SelectField label="Bay" value={bayId} onChange={(e) => setBayId(e.target.value)}>
          {bays.map((b) => <option key={b.id} value={b.id}>{b.name}</option>)}
        </SelectField>
        <SelectField label="Technician" value={technicianId} onChange={(e) => setTechnicianId(e.target.value)}>
          {technicians.map((t) => <option key={t.id} value={t.id}>{t.name}</option>)}
        </SelectField>
      </div>
      {refusal && (
        <p role="alert" className="rounded-card border-2 border-state-stop bg-state-stop-soft p-3 text-state-stop">
          ⚠ {refusal}
        </p>
      )}
      <div className="flex flex-wrap gap-3">
        <Button type="submit" disabled={move.isPending}>{move.isPending ? 'Moving…' : 'Move visit'}</Button>
        <Button kind="secondary" onClick={onCancel}>Cancel</Button>
      </div>
    </form>
  );
}
