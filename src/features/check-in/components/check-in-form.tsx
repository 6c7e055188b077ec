import { useState, type FormEvent } from 'react';
import { Button } from '../../../components/ui/button';
import { TextField } from '../../../components/ui/field';
import { ApiError } from '../../../lib/api-client';
import { todayIso } from '../../../lib/format';
import { useDraft } from '../../../lib/use-draft';
import { useMe } from '../../../lib/use-me';
import { CheckInSchema, type CheckIn } from '../../../../shared/schemas/due';
import type { BikeSummary } from '../../../../shared/schemas/bikes';
import { useCheckIn, type CheckInOutcome } from '../api';
import { DefectFields } from './defect-fields';
import { OdometerField, parseReading } from './odometer-field';

const SHOWN_PATHS = ['odometer', 'date', 'defect.category', 'defect.text'];
const BLANK = { odometer: '', date: '', reset: false, defectOpen: false, category: '', text: '', safetyCritical: false };

// A conflict's full message says what to do (it names the last reading); a validation detail is short.
const fieldError = (err: ApiError | null, path: string) => (err?.field(path) && err.status === 409 ? err.message : err?.field(path));

/** A bike planned into the workshop today: the desk answers before the check-in is saved. */
export interface HandOutCheck {
  question: string;
  onAnswer: (goesOut: boolean) => void;
}

export function CheckInForm({ bike, onDone, handOut }: { bike: BikeSummary; onDone: (r: CheckInOutcome, defect: boolean, critical: boolean) => void; handOut?: HandOutCheck }) {
  const me = useMe();
  const today = todayIso();
  const [draft, setDraft, clearDraft] = useDraft(`check-in.${bike.id}`, BLANK);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [asking, setAsking] = useState(false);
  const [answered, setAnswered] = useState(false);
  const checkIn = useCheckIn(bike, me.id);
  const set = (patch: Partial<typeof BLANK>) => {
    setDraft({ ...draft, ...patch });
    if (checkIn.error) checkIn.reset();
  };

  const submit = (confirmLargeJump = false, handOutAnswered = answered) => {
    const wantsDefect = draft.defectOpen && (draft.category !== '' || draft.text.trim() !== '' || draft.safetyCritical);
    const body = {
      odometer: parseReading(draft.odometer),
      date: draft.date && draft.date !== today ? draft.date : undefined,
      reset: draft.reset || undefined,
      confirmLargeJump: confirmLargeJump || undefined,
      defect: wantsDefect ? { category: draft.category, text: draft.text, safetyCritical: draft.safetyCritical } : undefined,
    };
    const parsed = CheckInSchema.safeParse(body);
    if (!parsed.success) return setErrors(Object.fromEntries(parsed.error.issues.map((i) => [i.path.join('.'), i.message])));
    setErrors({});
    if (handOut && !handOutAnswered) return setAsking(true);
    checkIn.mutate(parsed.data satisfies CheckIn, {
      onSuccess: (r) => {
        clearDraft();
        onDone(r, !!parsed.data.defect, !!parsed.data.defect?.safetyCritical);
      },
    });
  };
  const answer = (goesOut: boolean) => {
    handOut?.onAnswer(goesOut);
    setAnswered(true);
    setAsking(false);
    submit(false, true);
  };
  const onSubmit = (e: FormEvent) => {
    e.preventDefault();
    submit();
  };

  const err = checkIn.error instanceof ApiError ? checkIn.error : null;
  const needsConfirm = err?.code === 'needs_confirmation';
  const e = (path: string) => errors[path] ?? (needsConfirm ? undefined : fieldError(err, path));
  const general = err && !needsConfirm && !err.details.some((d) => SHOWN_PATHS.includes(d.path)) ? err.message : undefined;

  return (
    <form onSubmit={onSubmit} noValidate aria-label={`Check in ${bike.fleetNumber}`} className="flex flex-col gap-5 rounded-card border-2 border-ink-line bg-paper-raised p-5">
      <OdometerField bike={bike} value={draft.odometer} onChange={(odometer) => set({ odometer })} error={e('odometer')} />
      {needsConfirm && (
        <div role="alert" className="rounded-card border-4 border-state-soon bg-state-soon-soft p-4">
          <p className="text-lg font-semibold">◔ {err.message}</p>
          <div className="mt-3 flex flex-wrap gap-3">
            <Button className="min-h-14 text-lg" onClick={() => submit(true)} disabled={checkIn.isPending}>Yes, the reading is right</Button>
            <Button kind="secondary" className="min-h-14 text-lg" onClick={() => checkIn.reset()}>Let me correct it</Button>
          </div>
        </div>
      )}
      <TextField
        label="Date of the reading"
        type="date"
        max={today}
        value={draft.date || today}
        onChange={(x) => set({ date: x.target.value === today ? '' : x.target.value })}
        error={e('date')}
        hint="Today unless you are entering an earlier reading."
        className="max-w-xs"
      />
      {me.role !== 'desk' && (
        <label className="flex min-h-tap cursor-pointer items-center gap-3">
          <input type="checkbox" className="h-7 w-7 shrink-0" checked={draft.reset} onChange={(x) => set({ reset: x.target.checked })} />
          <span className="text-lg">New odometer fitted (this reading is its start)</span>
        </label>
      )}
      {draft.defectOpen ? (
        <>
          <DefectFields
            value={draft}
            onChange={(d) => set(d)}
            errors={{ category: e('defect.category'), text: e('defect.text') }}
          />
          <Button kind="quiet" className="self-start" onClick={() => set({ defectOpen: false, category: '', text: '', safetyCritical: false })}>
            No defect after all
          </Button>
        </>
      ) : (
        <Button kind="secondary" className="min-h-14 self-start text-lg" onClick={() => set({ defectOpen: true })}>
          Report a defect
        </Button>
      )}
      {asking && handOut && (
        <div role="alert" data-testid="hand-out-check" className="rounded-card border-4 border-state-soon bg-state-soon-soft p-4">
          <p className="text-lg font-semibold"><span aria-hidden>◔ </span>{handOut.question}</p>
          <div className="mt-3 flex flex-wrap gap-3">
            <Button className="min-h-14 text-lg" onClick={() => answer(true)} disabled={checkIn.isPending}>Yes, hand it out</Button>
            <Button kind="secondary" className="min-h-14 text-lg" onClick={() => answer(false)} disabled={checkIn.isPending}>No, keep it for the workshop</Button>
          </div>
          <p className="mt-2 text-sm">Either way the reading is saved.</p>
        </div>
      )}
      {general && <p role="alert" className="rounded-card border-2 border-state-stop bg-state-stop-soft p-3 text-lg text-state-stop">⚠ {general}</p>}
      <Button type="submit" className="min-h-16 text-xl sm:self-start sm:px-10" disabled={checkIn.isPending || needsConfirm || asking}>
        {checkIn.isPending ? 'Saving…' : 'Save check-in'}
      </Button>
      <p className="text-sm text-ink-muted">What you type is kept on this device until it is saved.</p>
    </form>
  );
}
