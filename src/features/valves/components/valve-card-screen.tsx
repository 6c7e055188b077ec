import { useMemo, useState } from 'react';
import { Link } from 'react-router-dom';
import { useQueryClient } from '@tanstack/react-query';
import { SafetyNote } from '../../../components/ui/states';
import { useMe } from '../../../lib/use-me';
import { bladeSeries } from '../../../../shared/domain/feeler';
import { CloseValveTaskSchema, type ValveCard, type ValveReadingInput } from '../../../../shared/schemas/valves';
import type { Task } from '../../../../shared/schemas/tasks';
import { useCloseValveTask, valveQueries } from '../api';
import { entryProblems, readEntry, toReadingInput, type ValveEntry } from '../card-state';
import { shimMarkingText } from '../clearance-format';
import { signOffErrors, type SignOffErrors } from '../sign-off-errors';
import { useCardDraft } from '../use-card-draft';
import { engineShimPlan, plannedFor } from '../engine-plan';
import { CardHeader } from './card-header';
import { CardToolbar } from './card-toolbar';
import { Cautions } from './cautions';
import { ShimPlanPanel } from './shim-plan-panel';
import { SignOffPanel } from './sign-off-panel';
import { PartsUsed, partsToSend } from '../../../components/ui/parts-used';
import { useDraft } from '../../../lib/use-draft';
import { SignedOff } from './signed-off';
import { ValveRow } from './valve-row';

export function ValveCardScreen({ card }: { card: ValveCard }) {
  const me = useMe();
  const qc = useQueryClient();
  const canWork = me.role === 'technician' || me.role === 'manager';
  const { draft, update, sync, clear, restoredFrom } = useCardDraft(card);
  const close = useCloseValveTask(card.task, me.id);
  const [queued, setQueued] = useState(false);
  const [attempted, setAttempted] = useState(false);
  const [reason, setReason] = useState('');
  const [errors, setErrors] = useState<SignOffErrors | null>(null);
  const [clientErrors, setClientErrors] = useState<Record<string, string>>({});
  const [done, setDone] = useState<Task | null>(null);
  const [usedParts, setUsedParts, clearUsedParts] = useDraft(`valve-parts.${card.task.id}`, {} as Record<string, string>);
  const series = useMemo(() => bladeSeries(draft.gauge), [draft.gauge]);
  const readings = useMemo(
    () => new Map(draft.entries.map((e) => [e.valveId, readEntry(e, card.valves.find((v) => v.valveId === e.valveId)!, card.adjuster)])),
    [draft.entries, card.valves, card.adjuster],
  );
  const labels = useMemo(() => new Map(card.valves.map((v) => [v.valveId, v.label])), [card.valves]);
  const plan = useMemo(() => engineShimPlan(card, readings), [card, readings]);
  if (done) return <SignedOff task={done} />;
  if (queued)
    return (
      <section aria-labelledby="sign-off-queued" className="flex flex-col gap-3 rounded-card border-4 border-ink-line bg-paper-raised p-5">
        <h2 id="sign-off-queued" className="text-2xl font-bold"><span aria-hidden>◌ </span>{card.task.fleetNumber}: sign-off saved on this device</h2>
        <p className="text-lg">
          There is no connection, so the sign-off waits here and is sent by itself when the connection is back. Lashline then books the shims and sets
          the next valve check; if it cannot take the sign-off, it comes back to you at the top of the screen with the reason, and the readings are still
          on this card.
        </p>
        <p className="font-semibold">The bike stays in the workshop until the sign-off has been taken.</p>
        <Link to="/tasks" className="self-start font-semibold text-accent underline">Back to my tasks</Link>
      </section>
    );
  const open = card.task.status === 'open' || card.task.status === 'in_progress';
  const setEntry = (next: ValveEntry) => update((d) => ({ ...d, entries: d.entries.map((e) => (e.valveId === next.valveId ? next : e)) }));
  const problems = (id: string) => [...(attempted ? entryProblems(readings.get(id)!) : []), ...(errors?.byValve.get(id) ?? [])];
  const outside = card.valves.filter((s) => { const st = readings.get(s.valveId)!.spec; return st === 'tight' || st === 'loose'; }).map((s) => s.label);
  const incomplete = attempted ? card.valves.filter((s) => entryProblems(readings.get(s.valveId)!).length > 0) : [];

  const submit = () => {
    setAttempted(true);
    setErrors(null);
    const firstBad = card.valves.find((s) => entryProblems(readings.get(s.valveId)!).length > 0);
    if (firstBad) return document.getElementById(`valve-${firstBad.valveId}`)?.scrollIntoView({ behavior: 'smooth', block: 'center' });
    const sent = draft.entries.map((e) => toReadingInput(e, readings.get(e.valveId)!, card.adjuster)).filter((r): r is ValveReadingInput => r !== null);
    const used = partsToSend(card.parts, usedParts);
    if (used.bad.length) return setClientErrors(Object.fromEntries(used.bad.map((id) => [`parts.${id}`, 'Type what was used as a number, 0 or more.'])));
    const parsed = CloseValveTaskSchema.safeParse({
      version: card.task.version,
      date: draft.date || undefined,
      notes: draft.notes.trim() || undefined,
      readings: sent,
      override: me.role === 'manager' && outside.length ? { reason } : undefined,
      parts: used.lines,
    });
    if (!parsed.success) return setClientErrors(Object.fromEntries(parsed.error.issues.map((i) => [i.path.join('.'), i.message])));
    setClientErrors({});
    close.mutate(parsed.data, {
      onSuccess: (res) => {
        // Queued: the readings stay on the device until the server has taken the sign-off.
        if (res.queued) return setQueued(true);
        clear();
        clearUsedParts();
        setDone(res.data.task);
      },
      onError: (err) => setErrors(signOffErrors(err, sent)),
    });
  };

  return (
    <article className="flex flex-col gap-6">
      <CardHeader card={card} canWork={canWork} />
      <Cautions />
      {!open && (
        <p role="status" className="rounded-card border-2 border-ink-line bg-paper-raised p-4 text-lg">
          This task is closed; the readings below cannot be changed. <Link to={`/fleet/${card.task.bikeId}`} className="text-accent underline">See the bike’s page.</Link>
        </p>
      )}
      <CardToolbar
        gauge={draft.gauge}
        unit={draft.unit}
        onGauge={(gauge) => update((d) => ({ ...d, gauge }))}
        onUnit={(unit) => update((d) => ({ ...d, unit }))}
        sync={sync}
        restoredFrom={restoredFrom}
      />
      <section aria-label="Valves" className="flex flex-col gap-4">
        {card.valves.map((slot) => (
          <ValveRow
            key={slot.valveId}
            slot={slot}
            adjuster={card.adjuster}
            entry={draft.entries.find((e) => e.valveId === slot.valveId)!}
            reading={readings.get(slot.valveId)!}
            series={series}
            sizesMm={card.shimSizesMm}
            unit={draft.unit}
            onChange={setEntry}
            planned={plannedFor(plan, slot.valveId, labels)}
            problems={problems(slot.valveId)}
            disabled={!open || !canWork}
          />
        ))}
      </section>
      {card.adjuster === 'shim-under-bucket' && (
        <ShimPlanPanel
          card={card}
          readings={readings}
          result={plan}
          unit={draft.unit}
          disabled={!open || !canWork}
          onUsePlan={(plan) =>
            update((d) => ({
              ...d,
              entries: d.entries.map((e) => {
                const p = plan.valves.find((v) => v.valveId === e.valveId);
                return p?.action === 'replace' && p.installMm != null ? { ...e, fittedText: shimMarkingText(p.installMm) } : e;
              }),
            }))
          }
        />
      )}
      {open && canWork && (
        <SignOffPanel
          notes={draft.notes}
          date={draft.date}
          onNotes={(notes) => update((d) => ({ ...d, notes }))}
          onDate={(date) => update((d) => ({ ...d, date }))}
          outside={outside}
          isManager={me.role === 'manager'}
          reason={reason}
          onReason={setReason}
          incomplete={incomplete.length}
          errors={errors}
          clientErrors={clientErrors}
          pending={close.isPending}
          disabled={false}
          onSubmit={submit}
          parts={
            <PartsUsed
              taskId={card.task.id}
              parts={card.parts}
              values={usedParts}
              onChange={(partId, raw) => setUsedParts({ ...usedParts, [partId]: raw })}
              error={(path) => clientErrors[path] ?? errors?.fields[path]}
            />
          }
          onReload={() => {
            setErrors(null);
            void qc.invalidateQueries({ queryKey: valveQueries.card(card.task.id).queryKey });
          }}
        />
      )}
      <SafetyNote />
    </article>
  );
}
