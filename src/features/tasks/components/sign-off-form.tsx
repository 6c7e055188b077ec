import { useState, type FormEvent } from 'react';
import { useQuery } from '@tanstack/react-query';
import { Button } from '../../../components/ui/button';
import { TextField } from '../../../components/ui/field';
import { ErrorPanel, Loading } from '../../../components/ui/states';
import { toast } from '../../../components/ui/toast';
import { ApiError } from '../../../lib/api-client';
import { todayIso } from '../../../lib/format';
import { useDraft } from '../../../lib/use-draft';
import { CloseTaskSchema, type Task } from '../../../../shared/schemas/tasks';
import { ReadingInput } from './reading-input';
import { judge, toReadingValue } from './reading-judge';
import { GroundingSummary } from './grounding-summary';
import { taskDetailQuery, useSignOff } from './task-readings';
import { PartsUsed, partsToSend } from '../../../components/ui/parts-used';

interface Props {
  task: Task;
  onCancel: () => void;
  onReload: () => void;
}

/** Signing off records the service as done today (or on the day given) at the bike's latest odometer, with the readings its plan asks for. */
export function SignOffForm({ task, onCancel, onReload }: Props) {
  const today = todayIso();
  const detail = useQuery(taskDetailQuery(task.id));
  const [draft, setDraft, clearDraft] = useDraft(`sign-off.${task.id}`, { notes: '', date: '', values: {} as Record<string, string>, parts: {} as Record<string, string> });
  const [errors, setErrors] = useState<Record<string, string>>({});
  const close = useSignOff();
  const templates = detail.data?.readings ?? [];
  const parts = detail.data?.parts ?? [];
  const setPart = (partId: string, raw: string) => {
    setDraft({ ...draft, parts: { ...(draft.parts ?? {}), [partId]: raw } });
    setErrors(({ [`parts.${partId}`]: _gone, ...rest }) => rest);
    if (close.error) close.reset();
  };
  const grounding = templates.filter((t) => judge(t, draft.values[t.id]).state === 'grounds');
  const setValue = (id: string, raw: string) => {
    setDraft({ ...draft, values: { ...draft.values, [id]: raw } });
    // A changed value is judged afresh: the old complaint about it no longer holds.
    setErrors(({ [`readings.${id}`]: _gone, ...rest }) => rest);
    if (close.error) close.reset();
  };

  const submit = (e: FormEvent) => {
    e.preventDefault();
    const problems: Record<string, string> = {};
    for (const t of templates) {
      const s = judge(t, draft.values[t.id]).state;
      if (s === 'empty') problems[`readings.${t.id}`] = t.kind === 'check' ? 'Choose done or not done.' : 'Record a value.';
      if (s === 'bad') problems[`readings.${t.id}`] = 'Type a number.';
    }
    const used = partsToSend(parts, draft.parts ?? {});
    for (const id of used.bad) problems[`parts.${id}`] = 'Type what was used as a number, 0 or more.';
    const parsed = CloseTaskSchema.safeParse({
      version: task.version,
      date: draft.date && draft.date !== today ? draft.date : undefined,
      notes: draft.notes.trim() || undefined,
      readings: Object.keys(problems).length ? [] : templates.map((t) => toReadingValue(t, draft.values[t.id] ?? '')),
      parts: used.bad.length ? undefined : used.lines,
    });
    const pathOf = (path: PropertyKey[]) =>
      path[0] === 'readings' ? `readings.${templates[Number(path[1])]?.id}` : path[0] === 'parts' ? (path.length > 1 ? `parts.${parts[Number(path[1])]?.partId}` : 'parts') : path.join('.');
    if (!parsed.success) for (const i of parsed.error.issues) problems[pathOf(i.path)] ??= i.message;
    setErrors(problems);
    if (!parsed.success || Object.keys(problems).length) return;
    close.mutate(
      { id: task.id, ...parsed.data },
      {
        onSuccess: (r) => {
          clearDraft();
          toast(
            r.grounded
              ? `Signed off: ${task.fleetNumber}, ${task.item}. ${task.fleetNumber} is now out of service: a reading is outside a safety limit. The managers are told.`
              : `Signed off: ${task.fleetNumber}, ${task.item}. Its next due date is counted from today.`,
          );
        },
        // The plan may have changed since the card opened (readings added or renamed): fetch what it asks for now.
        onError: (x) => x instanceof ApiError && x.status === 400 && void detail.refetch(),
      },
    );
  };
  const err = close.error instanceof ApiError ? close.error : null;
  const fieldError = (path: string) => errors[path] ?? err?.field(path);
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
      {detail.isPending ? (
        <Loading what="the readings to record" />
      ) : detail.error ? (
        <ErrorPanel error={detail.error} retry={() => detail.refetch()} />
      ) : (
        templates.length > 0 && (
          <fieldset className="flex flex-col gap-3">
            <legend className="mb-1 text-lg font-bold">Readings ({templates.length})</legend>
            {templates.map((t) => (
              <ReadingInput key={t.id} template={t} raw={draft.values[t.id] ?? ''} onChange={(raw) => setValue(t.id, raw)} error={fieldError(`readings.${t.id}`)} fleetNumber={task.fleetNumber} today={today} />
            ))}
          </fieldset>
        )
      )}
      {!detail.isPending && !detail.error && <PartsUsed taskId={task.id} parts={parts} values={draft.parts ?? {}} onChange={setPart} error={fieldError} />}
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
        {fieldError('notes') && <p role="alert" className="text-sm text-state-stop">⚠ {fieldError('notes')}</p>}
      </div>
      <TextField label="Done on" type="date" max={today} value={draft.date || today} onChange={(e) => setDraft({ ...draft, date: e.target.value === today ? '' : e.target.value })} error={fieldError('date')} className="max-w-xs" />
      {err && <p role="alert" className="font-semibold text-state-stop">⚠ {err.message}</p>}
      <GroundingSummary fleetNumber={task.fleetNumber} templates={grounding} values={draft.values} />
      <div className="flex flex-wrap gap-3">
        <Button type="submit" kind={grounding.length ? 'danger' : 'primary'} className="min-h-14 px-8 text-lg" disabled={close.isPending || detail.isPending || !!detail.error}>
          {grounding.length ? <><span aria-hidden>■</span> {close.isPending ? 'Signing off…' : 'Sign off and ground the bike'}</> : close.isPending ? 'Signing off…' : 'Sign off as done'}
        </Button>
        <Button kind="secondary" className="min-h-14 text-lg" onClick={onCancel}>Not yet</Button>
      </div>
    </form>
  );
}
