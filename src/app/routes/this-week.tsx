import { useEffect, useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { ThisWeekRoute } from '../../features/due/routes/this-week';
import { WarningsList } from '../../features/valves/components/warnings-list';
import { valveQueries } from '../../features/valves/api';
import { partQueries } from '../../features/parts/api';
import { ShortageList } from '../../features/parts/components/shortage-list';

/** The manager's board, with the valves that are closing up faster than their interval allows and the parts about to run out. */
export function ThisWeekBoard() {
  const warnings = useQuery(valveQueries.warnings());
  // The shortages come from every site's parts forecast, the heaviest read of the board: asked for
  // once the board's own reads have gone (the embedded database answers one query at a time), and
  // the board does not wait for them. The section sits below the fold, so its arrival moves nothing seen.
  const [asked, setAsked] = useState(false);
  useEffect(() => {
    const t = setTimeout(() => setAsked(true), 400);
    return () => clearTimeout(t);
  }, []);
  const short = useQuery({ ...partQueries.shortages(), enabled: asked });
  return (
    <ThisWeekRoute
      extraPending={warnings.isPending}
      extra={
        <>
          <section aria-labelledby="valve-warnings" className="flex flex-col gap-2">
            <h2 id="valve-warnings" className="flex items-center gap-2 text-xl font-bold">
              <span aria-hidden className="inline-flex h-7 w-7 items-center justify-center rounded-full bg-state-soon text-sm font-black text-ink">↘</span>
              Valves closing up ({warnings.data?.items.length ?? '…'})
            </h2>
            {warnings.data && <WarningsList items={warnings.data.items} />}
          </section>
          <section aria-labelledby="parts-short" className="flex flex-col gap-2">
            <h2 id="parts-short" className="flex items-center gap-2 text-xl font-bold">
              <span aria-hidden className="inline-flex h-7 w-7 items-center justify-center rounded-full bg-state-soon text-sm font-black text-ink">◔</span>
              Parts short before delivery ({short.data?.items.length ?? (short.error ? '?' : '…')})
            </h2>
            {short.data ? (
              <ShortageList items={short.data.items} />
            ) : short.error ? (
              <p role="alert" className="text-state-stop">⚠ The parts forecast could not be loaded: {short.error.message}</p>
            ) : (
              <p className="min-h-14 rounded-card border-2 border-dashed border-ink-line p-4 text-ink-soft">Working out which parts run short…</p>
            )}
          </section>
        </>
      }
    />
  );
}
