import { useMemo } from 'react';
import { Button } from '../../../components/ui/button';
import { DataTable, type Columns } from '../../../components/ui/data-table';
import type { ShimPlan, SizeCount, ValvePlan } from '../../../../shared/domain/shim-plan';
import type { ValveCard } from '../../../../shared/schemas/valves';
import { planValveOf, type EntryReading } from '../card-state';
import { sourceText } from '../engine-plan';
import { clearanceText, fmtShim, type ClearanceUnit } from '../clearance-format';

interface Props {
  card: ValveCard;
  readings: Map<string, EntryReading>;
  result: ShimPlan | string | null;
  unit: ClearanceUnit;
  onUsePlan: (plan: ShimPlan) => void;
  disabled?: boolean;
}

const ACTION: Record<ValvePlan['action'], string> = { keep: 'Keep', replace: 'Change', 'none-fits': 'No size fits' };
const counts = (list: SizeCount[]) => list.map((s) => `${s.count} × ${fmtShim(s.sizeMm)}${s.condition ? ` (${s.condition})` : ''}`).join(', ');

/** The whole engine at once: a removed shim often fits another valve, which saves buying one. */
export function ShimPlanPanel({ card, readings, result, unit, onUsePlan, disabled }: Props) {
  const labels = useMemo(() => new Map(card.valves.map((v) => [v.valveId, v.label])), [card.valves]);
  const waiting = card.valves.filter((s) => !planValveOf(s, readings.get(s.valveId)!));
  const columns: Columns<ValvePlan> = [
    { id: 'valve', accessorFn: (p) => labels.get(p.valveId) ?? p.valveId, header: 'Valve', cell: (c) => <span className="font-semibold">{labels.get(c.row.original.valveId)}</span> },
    { id: 'action', accessorFn: (p) => ACTION[p.action], header: 'Action' },
    { id: 'in', accessorFn: (p) => p.installMm ?? 0, header: 'Shim in', cell: (c) => <span className="num">{c.row.original.installMm == null ? '—' : fmtShim(c.row.original.installMm)}</span> },
    { id: 'from', accessorFn: (p) => sourceText(p, labels), header: 'From' },
    { id: 'expected', accessorFn: (p) => p.expectedClearanceMm ?? 0, header: 'Expected clearance', cell: (c) => <span className="num">{clearanceText(c.row.original.expectedClearanceMm, unit)}</span> },
  ];
  return (
    <section aria-labelledby="shim-plan" className="flex flex-col gap-3 rounded-card border-2 border-ink-line bg-paper-raised p-4">
      <h2 id="shim-plan" className="text-xl font-bold">Shim plan for the whole engine</h2>
      <p className="text-ink-soft">Shims out of this engine are used first, then the shelf at {card.task.siteName} (used before new), and only then an order.</p>
      {waiting.length > 0 && <p className="text-ink-soft">Waiting for the as-found clearance and shim of: {waiting.map((w) => w.label).join(', ')}.</p>}
      {typeof result === 'string' && <p role="alert" className="text-state-stop">⚠ {result}</p>}
      {result && typeof result !== 'string' && (
        <>
          <DataTable caption="Shim plan per valve" columns={columns} data={result.valves} pageSize={64} />
          <div className="num grid gap-2 text-lg sm:grid-cols-3">
            <p><span className="font-semibold">To order: </span>{result.order.length ? counts(result.order) : 'nothing'}</p>
            <p><span className="font-semibold">From the shelf: </span>{result.stockUsed.length ? counts(result.stockUsed) : 'nothing'}</p>
            <p><span className="font-semibold">Back to the shelf: </span>{result.returnedToStock.length ? counts(result.returnedToStock) : 'nothing'}</p>
          </div>
          {result.valves.some((v) => v.action === 'replace') && (
            <Button kind="secondary" className="min-h-14 self-start" disabled={disabled} onClick={() => onUsePlan(result)}>
              Fitted as planned: fill “shim fitted”
            </Button>
          )}
        </>
      )}
    </section>
  );
}
