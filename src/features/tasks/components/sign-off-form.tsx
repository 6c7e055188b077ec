import { useState, type FormEvent } from 'react';
import { Button } from '../../../components/ui/button';
import { TextField } from '../../../components/ui/field';
import { toast } from '../../../components/ui/toast';
import { ApiError } from '../../../lib/api-client';
import { todayIso } from '../../../lib/format';
import { useDraft } from '../../../lib/use-draft';
import { CloseTaskSchema, type Task } from '../../../../shared/schemas/tasks';
import { useCloseTask } from '../api';

interface Props {
  task: Task;
  onCancel: () => void;
  onReload: () => void;
}

/** Signing off records the service as done today (or on the day given) at the bike's latest odometer. */
export function SignOffForm({ task, onCancel, onReload }: Props) {
  const today = todayIso();
  const [draft, setDraft, clearDraft] = useDraft(`sign-off.${task.id}`, { notes: '', date: '' });
  const [errors, setErrors] = useState<Record<string, string>>({});
  const close = useCloseTask();
  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = CloseTaskSchema.safeParse({
      version: task.version,
      date: draft.date && draft.date !== today ? draft.date : undefined,
      notes: draft.notes.trim() || undefined,
    });
    if (!parsed.success) return setErrors(Object.fromEntries(parsed.error.issues.map((i) => [i.path.join('.'), i.message])));
    setErrors({});
    close.mutate(
      { id: task.id, ...parsed.data },
      {
        onSuccess: () => {
          clearDraft();
          toast(`Signed off: ${task.fleetNumber}, ${task.item}. Its next due date is counted from today.`);
        },
      },
    );
  };
  const err = close.error instanceof ApiError ? close.error : null;
  if (err?.status === 409)
    return (
      <div role="alert" className="rounded-card border-2 border-state-soon bg-state-soon-soft p-4">
        <p className="text-lg font-bold">◔ Someone else signed this task off or changed it.</p>
        <p className="mt-1">{err.message}</p>
        <Button className="mt-3 min-h-14 text-lg" onClick={onReload}>Reload my tasks</Button>
      </div>
    );
  return (
    <form onSubmit={submit} noValidate aria-label={`Sign off ${task.fleetNumber} ${task.item}`} className="flex flex-col gap-3 rounded-card border-2 border-accent bg-paper p-4">
      <div>
        <label htmlFor={`notes-${task.id}`} className="mb-1 block text-lg font-semibold">Notes (optional)</label>
        <textarea
          id={`notes-${task.id}`}
          rows={3}
          value={draft.notes}
          onChange={(e) => setDraft({ ...draft, notes: e.target.value })}
          placeholder="e.g. chain adjusted to 30 mm slack, lubed"
          className="w-full rounded-card border-2 border-ink-line bg-paper-raised px-3 py-2 text-lg focus:border-accent"
        />
        {(errors.notes ?? err?.field('notes')) && <p role="alert" className="text-sm text-state-stop">⚠ {errors.notes ?? err?.field('notes')}</p>}
      </div>
      <TextField label="Done on" type="date" max={today} value={draft.date || today} onChange={(e) => setDraft({ ...draft, date: e.target.value === today ? '' : e.target.value })} error={errors.date ?? err?.field('date')} className="max-w-xs" />
      {err && !err.details.length && <p role="alert" className="text-state-stop">⚠ {err.message}</p>}
      <div className="flex flex-wrap gap-3">
        <Button type="submit" className="min-h-14 px-8 text-lg" disabled={close.isPending}>{close.isPending ? 'Signing off…' : 'Sign off as done'}</Button>
        <Button kind="secondary" className="min-h-14 text-lg" onClick={onCancel}>Not yet</Button>
      </div>
    </form>
  );
}
