import { Button } from '../../../components/ui/button';
import { TextField } from '../../../components/ui/field';
import { TextAreaField } from '../../../components/ui/text-area-field';
import { todayIso } from '../../../lib/format';
import type { ReactNode } from 'react';
import type { SignOffErrors } from '../sign-off-errors';

interface Props {
  notes: string;
  date: string;
  onNotes: (v: string) => void;
  onDate: (v: string) => void;
  /** Valves that would be left outside their spec. */
  outside: string[];
  isManager: boolean;
  reason: string;
  onReason: (v: string) => void;
  /** Valves still missing something, counted for the message beside the button. */
  incomplete: number;
  errors: SignOffErrors | null;
  clientErrors: Record<string, string>;
  pending: boolean;
  disabled: boolean;
  onSubmit: () => void;
  onReload: () => void;
  /** What the check took from the shelf, editable. */
  parts?: ReactNode;
}

export function SignOffPanel(p: Props) {
  const today = todayIso();
  const blocked = p.outside.length > 0 && !p.isManager;
  const field = (k: string) => p.clientErrors[k] ?? p.errors?.fields[k];
  return (
    <section aria-labelledby="sign-off" className="flex flex-col gap-4 rounded-card border-2 border-accent bg-paper p-4">
      <h2 id="sign-off" className="text-xl font-bold">Sign off</h2>
      {p.outside.length > 0 && (
        <div role="alert" className="rounded-card border-2 border-state-stop bg-state-stop-soft p-4 text-lg">
          <p className="font-bold text-state-stop"><span aria-hidden>■ </span>Left outside spec: {p.outside.join(', ')}.</p>
          <p>
            {p.isManager
              ? 'You can sign off with the valve left like this only by saying why, below. It is recorded with your name.'
              : 'Adjust these valves into spec. If one has to stay as it is, a manager signs the card off with a reason: this card is saved and opens on their device as it is now.'}
          </p>
        </div>
      )}
      {p.isManager && p.outside.length > 0 && (
        <TextAreaField label="Why the valve is left outside its spec" value={p.reason} onChange={(e) => p.onReason(e.target.value)} error={field('override.reason')} placeholder="e.g. seat work booked for Monday; bike stays grounded until then" />
      )}
      {p.parts}
      <TextAreaField label="Notes (optional)" value={p.notes} onChange={(e) => p.onNotes(e.target.value)} error={field('notes')} placeholder="e.g. cam chain tensioner checked" className="text-lg" />
      <TextField label="Done on" type="date" max={today} value={p.date || today} onChange={(e) => p.onDate(e.target.value === today ? '' : e.target.value)} error={field('date')} className="max-w-xs text-lg" />
      {p.errors?.stale ? (
        <div role="alert" className="rounded-card border-2 border-state-soon bg-state-soon-soft p-4">
          <p className="text-lg font-bold"><span aria-hidden>◔ </span>{p.errors.message}</p>
          <Button className="mt-3 min-h-14 text-lg" onClick={p.onReload}>Reload the task, keep my readings</Button>
        </div>
      ) : (
        p.errors && <p role="alert" className="font-medium text-state-stop">⚠ {p.errors.message}</p>
      )}
      {p.incomplete > 0 && <p className="text-lg text-state-stop">⚠ {p.incomplete === 1 ? 'One valve needs' : `${p.incomplete} valves need`} attention: see the marked rows above.</p>}
      <div className="flex flex-wrap items-center gap-3">
        <Button className="min-h-14 px-8 text-lg" disabled={p.disabled || p.pending || blocked} onClick={p.onSubmit}>
          {p.pending ? 'Signing off…' : 'Sign off the valve check'}
        </Button>
        {blocked && <span className="text-ink-soft">Sign-off waits until every valve is in spec.</span>}
      </div>
    </section>
  );
}
