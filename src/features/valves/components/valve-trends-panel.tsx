import { lazy, Suspense } from 'react';
import { useQuery } from '@tanstack/react-query';
import { FallbackBoundary } from '../../../components/ui/fallback-boundary';
import { Empty, ErrorPanel, Loading } from '../../../components/ui/states';
import { ToneBadge } from '../../../components/ui/tone-badge';
import { formatKm } from '../../../lib/format';
import type { ValveTrendView } from '../../../../shared/schemas/valves';
import { valveQueries } from '../api';
import { specText } from '../clearance-format';
import { ValveTrendTable } from './valve-trend-table';

// The chart library is large: it loads only when a bike page shows trends.
const ValveTrendChart = lazy(() => import('./valve-trend-chart').then((m) => ({ default: m.ValveTrendChart })));

function TrendState({ v }: { v: ValveTrendView }) {
  if (v.warning) return <ToneBadge tone="stop" icon="⚠">Check early</ToneBadge>;
  if (v.tightening) return <ToneBadge tone="soon" icon="▼">Closing up</ToneBadge>;
  if (v.closureMmPer1000Km == null) return <ToneBadge tone="neutral" icon="…">Too few checks for a trend</ToneBadge>;
  return <ToneBadge tone="ok" icon="✓">Steady</ToneBadge>;
}

function ValveTrend({ v }: { v: ValveTrendView }) {
  return (
    <section aria-labelledby={`trend-${v.valveId}`} className={`flex flex-col gap-2 rounded-card border-2 bg-paper-raised p-3 ${v.warning ? 'border-state-stop' : 'border-ink-line'}`}>
      <header className="flex flex-wrap items-start justify-between gap-2">
        <div>
          <h3 id={`trend-${v.valveId}`} className="font-bold">{v.label}</h3>
          <p className="num text-sm text-ink-soft">Cold spec {specText(v.specMinMm, v.specMaxMm, 'mm')}</p>
        </div>
        <TrendState v={v} />
      </header>
      {v.closureMmPer1000Km != null && (
        <p className="num text-sm">
          {v.closureMmPer1000Km > 0 ? 'Closing' : 'Opening'} {Math.abs(v.closureMmPer1000Km).toFixed(4)} mm per 1,000 km
          {v.kmAtSpecMin != null && <> · reaches {v.specMinMm.toFixed(2)} mm near {formatKm(v.kmAtSpecMin)}</>}
          {v.nextCheckKm != null && (v.warning ? <strong className="text-state-stop">, before the next check at {formatKm(v.nextCheckKm)}</strong> : <> · next check at {formatKm(v.nextCheckKm)}</>)}
        </p>
      )}
      <FallbackBoundary fallback={<ValveTrendTable valve={v} />}>
        <Suspense fallback={<ValveTrendTable valve={v} />}>
          <ValveTrendChart valve={v} />
          <details>
            <summary className="min-h-tap cursor-pointer content-center font-semibold text-accent">The numbers as a table</summary>
            <ValveTrendTable valve={v} />
          </details>
        </Suspense>
      </FallbackBoundary>
    </section>
  );
}

/** A bike's valve clearances over its life, one small chart per valve, for the bike's page. */
export function ValveTrendsPanel({ bikeId }: { bikeId: string }) {
  const q = useQuery(valveQueries.bike(bikeId));
  return (
    <section aria-labelledby="valve-trends" className="flex flex-col gap-3">
      <h2 id="valve-trends" className="text-xl font-bold">Valve clearance trends</h2>
      {q.isPending ? (
        <Loading what="valve readings" />
      ) : q.error ? (
        <ErrorPanel error={q.error} retry={() => q.refetch()} />
      ) : !q.data.valves.some((v) => v.points.length) ? (
        <Empty title="No valve readings yet">The first signed-off valve card starts the history.</Empty>
      ) : (
        <>
          <p className="text-sm text-ink-muted">
            Clearance in mm against km. Dots: as found (filled) and as left (ring). Green band: the cold spec. Dashed red line: the trend from the last check to the next one, fitted so that one odd reading does not swing it.
          </p>
          <div className="grid gap-3 md:grid-cols-2 xl:grid-cols-4">
            {q.data.valves.map((v) => (
              <ValveTrend key={v.valveId} v={v} />
            ))}
          </div>
        </>
      )}
    </section>
  );
}
