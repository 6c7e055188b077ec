import { useState } from 'react';
import { useSearchParams } from 'react-router-dom';
import { useQuery } from '@tanstack/react-query';
import { Button } from '../../../components/ui/button';
import { SelectField } from '../../../components/ui/field';
import { Segmented } from '../../../components/ui/segmented';
import { Empty, ErrorPanel, Loading, PageHeader, SafetyNote } from '../../../components/ui/states';
import { toast } from '../../../components/ui/toast';
import { addDaysIso, formatDateTime } from '../../../lib/format';
import { referenceQueries } from '../../../lib/reference-queries';
import { formatDay, sameTimeOnDay } from '../../../lib/site-time';
import { useMe } from '../../../lib/use-me';
import { todayInZone } from '../../../../shared/domain/dates';
import type { Site } from '../../../../shared/schemas/reference';
import type { PlanAnswer, PlanVisit } from '../../../../shared/schemas/plan';
import { planQueries, useMoveVisit, useReplan } from '../api';
import { BoardGrid, type BoardRow } from '../components/board-grid';
import { BOARD_DAYS, boardDays, bookingsForVisit, type RowKind } from '../components/board-layout';
import { UnplacedList } from '../components/unplaced-list';
import { VisitDetail } from '../components/visit-detail';

/** The workshop plan: two weeks of visits by bay or by technician, with what could not be placed. */
export function PlanBoardRoute() {
  const sites = useQuery(referenceQueries.sites());
  const [params] = useSearchParams();
  if (sites.isPending) return <Loading what="your sites" />;
  if (sites.error) return <ErrorPanel error={sites.error} retry={() => sites.refetch()} />;
  if (!sites.data.items.length) return <Empty title="No sites yet">An administrator adds sites and sets who works at each.</Empty>;
  const site = sites.data.items.find((s) => s.id === params.get('site')) ?? sites.data.items[0];
  return <PlanBoard key={site.id} site={site} sites={sites.data.items} />;
}

/** Board rows for the site, plus any row a visit names that the list lacks, so no visit goes unseen. */
function rowsFor(answer: PlanAnswer, siteId: string, kind: RowKind): BoardRow[] {
  const rows = (kind === 'bay' ? answer.bays : answer.technicians).filter((r) => r.siteId === siteId).map(({ id, name }) => ({ id, name }));
  for (const v of answer.visits.filter((x) => x.siteId === siteId)) {
    const [id, name] = kind === 'bay' ? [v.bayId, v.bayName] : [v.technicianId, v.technicianName];
    if (!rows.some((r) => r.id === id)) rows.push({ id, name });
  }
  return rows;
}

function PlanBoard({ site, sites }: { site: Site; sites: Site[] }) {
  const me = useMe();
  const canMove = me.role === 'manager' || me.role === 'admin';
  const [params, setParams] = useSearchParams();
  const tz = site.timeZone;
  const from = params.get('from') ?? todayInZone(tz);
  const kind: RowKind = params.get('by') === 'technician' ? 'technician' : 'bay';
  const days = boardDays(from);
  const q = useQuery(planQueries.board({ site: site.id, from, to: days[days.length - 1] }));
  const [selectedId, setSelectedId] = useState<string | null>(null);
  const [refusal, setRefusal] = useState<string | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const move = useMoveVisit();
  const replan = useReplan();
  const setParam = (patch: Record<string, string | null>) => {
    const next = new URLSearchParams(params);
    for (const [k, v] of Object.entries(patch)) if (v === null) next.delete(k); else next.set(k, v);
    setParams(next, { replace: true });
  };
  const moved = (message: string) => {
    setRefusal(null);
    setDone(message);
    toast(message);
  };

  const onDrop = (v: PlanVisit, target: { rowId: string; day: string }) => {
    setRefusal(null);
    setDone(null);
    const start = sameTimeOnDay(v.start, target.day, tz);
    const body = { start, bayId: kind === 'bay' ? target.rowId : v.bayId, technicianId: kind === 'technician' ? target.rowId : v.technicianId };
    const where = kind === 'bay' ? q.data?.bays.find((b) => b.id === body.bayId)?.name : q.data?.technicians.find((t) => t.id === body.technicianId)?.name;
    move.mutate(
      { id: v.id, move: body },
      { onSuccess: () => moved(`${v.fleetNumber} moved to ${formatDay(target.day)}${where ? `, ${where}` : ''}.`), onError: (e) => setRefusal(e.message) },
    );
  };

  const answer = q.data;
  const selected = answer?.visits.find((v) => v.id === selectedId) ?? null;
  const needed = answer && selected ? bookingsForVisit(answer, selected) : [];

  return (
    <div className="flex flex-col gap-4">
      <PageHeader title="Plan">
        {canMove && (
          <Button
            disabled={replan.isPending}
            onClick={() => {
              setRefusal(null);
              replan.mutate(site.id, { onSuccess: (a) => moved(`Plan worked out again for ${site.name}: ${a.visits.length} visits, ${a.unplaced.length} not placed.`) });
            }}
          >
            {replan.isPending ? 'Re-planning…' : 'Re-plan now'}
          </Button>
        )}
      </PageHeader>
      <div className="flex flex-wrap items-end gap-4">
        {sites.length > 1 && (
          <SelectField label="Site" value={site.id} onChange={(e) => setParam({ site: e.target.value, from: null })} className="w-56">
            {sites.map((s) => <option key={s.id} value={s.id}>{s.name}</option>)}
          </SelectField>
        )}
        <Segmented<RowKind> legend="Rows" value={kind} onChange={(k) => setParam({ by: k === 'bay' ? null : k })} options={[{ value: 'bay', label: 'By bay' }, { value: 'technician', label: 'By technician' }]} />
        <div className="flex flex-wrap items-center gap-2">
          <Button kind="secondary" onClick={() => setParam({ from: addDaysIso(from, -BOARD_DAYS) })}>← Previous two weeks</Button>
          <Button kind="secondary" onClick={() => setParam({ from: null })}>From today</Button>
          <Button kind="secondary" onClick={() => setParam({ from: addDaysIso(from, BOARD_DAYS) })}>Next two weeks →</Button>
        </div>
      </div>
      <p className="num text-ink-soft">
        {site.name}: {formatDay(days[0])} to {formatDay(days[days.length - 1])}, on the site’s clock ({tz}).{' '}
        {answer && (answer.plannedAt ? `Worked out ${formatDateTime(answer.plannedAt)}.` : 'Not worked out yet.')}
        {!canMove && ' A manager moves visits; you can look.'}
      </p>
      {refusal && (
        <div role="alert" data-testid="move-refusal" className="flex flex-wrap items-center justify-between gap-3 rounded-card border-2 border-state-stop bg-state-stop-soft p-3">
          <p className="text-state-stop"><span aria-hidden>⚠ </span>The visit stays where it was. {refusal}</p>
          <Button kind="secondary" onClick={() => setRefusal(null)}>Dismiss</Button>
        </div>
      )}
      {replan.error && <p role="alert" className="rounded-card border-2 border-state-stop bg-state-stop-soft p-3 text-state-stop">⚠ {replan.error.message}</p>}
      {done && <p role="status" className="sr-only">{done}</p>}
      {move.isPending && <p role="status">Moving the visit…</p>}
      {q.isPending ? (
        <Loading what="the plan" />
      ) : q.error ? (
        <ErrorPanel error={q.error} retry={() => q.refetch()} />
      ) : (
        <div className="grid gap-4 xl:grid-cols-[minmax(0,1fr)_20rem]">
          <div className="flex min-w-0 flex-col gap-4">
            {answer!.visits.every((v) => v.siteId !== site.id) && (
              <p className="rounded-card border-2 border-dashed border-ink-line p-4 text-ink-soft">No visits planned at {site.name} in these two weeks.{canMove && ' Re-plan now works the plan out from the open tasks.'}</p>
            )}
            <BoardGrid
              answer={answer!}
              siteId={site.id}
              timeZone={tz}
              days={days}
              kind={kind}
              rows={rowsFor(answer!, site.id, kind)}
              selected={selected}
              needed={needed}
              canMove={canMove && !move.isPending}
              onSelect={(v) => setSelectedId(v.id === selectedId ? null : v.id)}
              onDrop={onDrop}
            />
            {selected && (
              <VisitDetail
                visit={selected}
                timeZone={tz}
                needed={needed}
                bays={rowsFor(answer!, site.id, 'bay')}
                technicians={rowsFor(answer!, site.id, 'technician')}
                canMove={canMove}
                onMoved={moved}
                onClose={() => setSelectedId(null)}
              />
            )}
          </div>
          <UnplacedList items={answer!.unplaced.filter((u) => u.siteId === site.id)} />
        </div>
      )}
      <SafetyNote />
    </div>
  );
}
