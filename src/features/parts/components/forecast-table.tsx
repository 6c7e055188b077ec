import { DataTable, type Columns } from '../../../components/ui/data-table';
import { formatQty } from '../../../../shared/domain/parts';
import type { ForecastPart } from '../../../../shared/schemas/parts';
import { formatFigure, weekLabel } from '../parts-words';

/** Parts that run out come first, the earliest first; then the rest by name. */
export function byRunOut(a: ForecastPart, b: ForecastPart) {
  const ao = a.runsOutWeek ?? '\uffff';
  const bo = b.runsOutWeek ?? '\uffff';
  if (ao !== bo) return ao < bo ? -1 : 1;
  if (a.shortBeforeDelivery !== b.shortBeforeDelivery) return a.shortBeforeDelivery ? -1 : 1;
  return a.name.localeCompare(b.name);
}

export function RunsOut({ p, weeks }: { p: ForecastPart; weeks: number }) {
  return (
    <div className="flex flex-col gap-1">
      <span className={`num whitespace-nowrap ${p.runsOutWeek ? 'font-semibold' : 'text-ink-soft'}`}>{p.runsOutWeek ? `Week of ${weekLabel(p.runsOutWeek)}` : `Lasts the ${weeks} weeks`}</span>
      {p.shortBeforeDelivery && (
        <span className="max-w-64 text-sm font-semibold text-state-stop">
          <span aria-hidden>⚠ </span>Runs out before an order placed today can arrive (lead time {p.leadTimeDays} days)
        </span>
      )}
    </div>
  );
}

interface Props {
  parts: ForecastPart[];
  selectedId: string | null;
  onSelect: (partId: string) => void;
}

/** Need per week as likely / cautious figures, with when each part runs out. */
export function ForecastTable({ parts, selectedId, onSelect }: Props) {
  const weeks = parts[0]?.weeks.map((w) => w.weekStart) ?? [];
  const columns: Columns<ForecastPart> = [
    {
      id: 'part', accessorKey: 'name', header: 'Part',
      cell: (c) => {
        const p = c.row.original;
        return (
          <button type="button" aria-pressed={p.partId === selectedId} onClick={() => onSelect(p.partId)} className="min-h-tap text-left font-semibold text-accent underline-offset-4 hover:underline aria-pressed:text-ink">
            {p.name}
            <span className="num block text-sm font-normal text-ink-soft">{p.partNumber}</span>
          </button>
        );
      },
    },
    { id: 'onHand', accessorKey: 'onHand', header: 'On hand', cell: (c) => <span className="num whitespace-nowrap">{formatQty(c.row.original.onHand, c.row.original.unit)}</span> },
    ...weeks.map(
      (weekStart, i): Columns<ForecastPart>[number] => ({
        id: `w${i}`, header: weekLabel(weekStart), enableSorting: false,
        cell: (c) => {
          const w = c.row.original.weeks[i];
          return w ? <span className="num whitespace-nowrap">{formatFigure(w.p50)} / {formatFigure(w.p90)}</span> : '—';
        },
      }),
    ),
    { id: 'out', accessorFn: (p) => p.runsOutWeek ?? '\uffff', header: 'Runs out', cell: (c) => <RunsOut p={c.row.original} weeks={weeks.length} /> },
  ];
  return <DataTable caption="Forecast need per week, likely / cautious" columns={columns} data={[...parts].sort(byRunOut)} pageSize={100} empty="No parts are stocked at this site yet." />;
}
