import { useQuery } from '@tanstack/react-query';
import { ErrorPanel, Loading, PageHeader, SafetyNote } from '../../../components/ui/states';
import { valveQueries } from '../api';
import { RollupTable } from '../components/rollup-table';
import { WarningsList } from '../components/warnings-list';

/** The fleet's valves at a glance: bikes to check early, and patterns shared by a model. */
export function FleetValvesRoute() {
  const warnings = useQuery(valveQueries.warnings());
  const rollup = useQuery(valveQueries.rollup());
  return (
    <article className="flex flex-col gap-6">
      <PageHeader title="Valve clearances across the fleet" />
      <section aria-labelledby="warnings" className="flex flex-col gap-2">
        <h2 id="warnings" className="text-xl font-bold">Check early</h2>
        <p className="text-ink-soft">From each valve’s trend over its past checks. Bring these valve checks forward.</p>
        {warnings.isPending ? <Loading what="valve warnings" /> : warnings.error ? <ErrorPanel error={warnings.error} retry={() => warnings.refetch()} /> : <WarningsList items={warnings.data.items} />}
      </section>
      <section aria-labelledby="rollup" className="flex flex-col gap-2">
        <h2 id="rollup" className="text-xl font-bold">Per model and valve position</h2>
        <p className="text-ink-soft">How fast each valve position closes up, as the median over the bikes of a model with at least three checks.</p>
        {rollup.isPending ? <Loading what="the roll-up" /> : rollup.error ? <ErrorPanel error={rollup.error} retry={() => rollup.refetch()} /> : <RollupTable items={rollup.data.items} />}
      </section>
      <SafetyNote />
    </article>
  );
}
