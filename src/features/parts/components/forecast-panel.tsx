import { lazy, Suspense, useState } from 'react';
import { Button } from '../../../components/ui/button';
import { FallbackBoundary } from '../../../components/ui/fallback-boundary';
import { Loading } from '../../../components/ui/states';
import { formatQty } from '../../../../shared/domain/parts';
import type { Forecast } from '../../../../shared/schemas/parts';
import { formatFigure } from '../parts-words';
import { ForecastTable, RunsOut } from './forecast-table';

// The chart library is large: it loads only when someone opens a part's chart.
const ForecastChart = lazy(() => import('./forecast-chart').then((m) => ({ default: m.ForecastChart })));

/** The next weeks' need at the site, part by part, with one part's chart on request. */
export function ForecastPanel({ forecast }: { forecast: Forecast }) {
  const [selectedId, setSelectedId] = useState<string | null>(null);
  const part = forecast.parts.find((p) => p.partId === selectedId);
  const weeks = forecast.parts[0]?.weeks.length ?? 0;
  return (
    <div className="flex flex-col gap-3">
      <p className="text-ink-soft">
        Each week shows <strong>likely / cautious</strong> need: in {forecast.runs} simulated runs of the fleet’s coming services, half use no more than the likely figure, and nine in ten no more than the cautious one.
        Runs out is the week the cautious need passes what is on hand. Choose a part to see its chart.
      </p>
      <ForecastTable parts={forecast.parts} selectedId={selectedId} onSelect={(id) => setSelectedId(id === selectedId ? null : id)} />
      {part && (
        <section aria-labelledby="forecast-part" className="flex flex-col gap-3 rounded-card border-2 border-accent bg-paper-raised p-4">
          <header className="flex flex-wrap items-start justify-between gap-3">
            <div>
              <h3 id="forecast-part" className="text-lg font-bold">{part.name} <span className="num font-normal text-ink-soft">{part.partNumber}</span></h3>
              <p className="num text-sm">
                On hand {formatQty(part.onHand, part.unit)} · on order {formatQty(part.onOrder, part.unit)} · lead time {part.leadTimeDays} days ·
                suggested order {part.suggested.quantity > 0 ? `${formatQty(part.suggested.quantity, part.unit)} (${part.suggested.packs} ${part.suggested.packs === 1 ? 'pack' : 'packs'})` : 'none'}
              </p>
              <RunsOut p={part} weeks={weeks} />
            </div>
            <Button kind="secondary" onClick={() => setSelectedId(null)}>Close chart</Button>
          </header>
          <FallbackBoundary key={part.partId} fallback={<p className="text-ink-soft">The chart could not be drawn; the table above has the same numbers.</p>}>
            <Suspense fallback={<Loading what="the chart" />}>
              <ForecastChart part={part} today={forecast.today} />
            </Suspense>
          </FallbackBoundary>
          <p className="text-sm text-ink-muted">
            Solid dark line: likely need added up week by week. Dashed blue line: cautious need. Green line: on hand ({formatFigure(part.onHand)})
            {part.onOrder > 0 && `, dashed green: with what is on order (${formatFigure(part.onHand + part.onOrder)})`}. Red line: the week it runs out.
          </p>
        </section>
      )}
    </div>
  );
}
