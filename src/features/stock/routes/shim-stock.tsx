import { useMemo, useState } from 'react';
import { useSearchParams } from 'react-router-dom';
import { useQuery } from '@tanstack/react-query';
import { SelectField } from '../../../components/ui/field';
import { Empty, ErrorPanel, Loading, PageHeader, SafetyNote } from '../../../components/ui/states';
import { referenceQueries } from '../../../lib/reference-queries';
import { useMe } from '../../../lib/use-me';
import { stockQueries } from '../api';
import { stockRows } from '../stock-rows';
import { AdjustForm } from '../components/adjust-form';
import { MinimumForm } from '../components/minimum-form';
import { ReorderList } from '../components/reorder-list';
import { StockTable } from '../components/stock-table';

/** The shim shelf of one site: counts by size, changes with a reason, minimums, and what to order. */
export function ShimStockRoute() {
  const me = useMe();
  const [params, setParams] = useSearchParams();
  const sites = useQuery(referenceQueries.sites());
  const models = useQuery(referenceQueries.models());
  const mine = (sites.data?.items ?? []).filter((s) => me.siteIds.includes(s.id));
  const siteId = params.get('site') && mine.some((s) => s.id === params.get('site')) ? params.get('site')! : (mine[0]?.id ?? '');
  const stock = useQuery(stockQueries.shims(siteId));
  const reorder = useQuery(stockQueries.reorder(siteId));
  const [size, setSize] = useState<number | null>(null);
  const rows = useMemo(() => stockRows(stock.data?.items ?? [], models.data?.items ?? []), [stock.data, models.data]);
  const canAdjust = me.role === 'technician' || me.role === 'manager';
  const pick = (mm: number) => {
    setSize(mm);
    document.getElementById('adjust')?.scrollIntoView({ behavior: 'smooth', block: 'start' });
  };

  if (sites.isPending) return <Loading what="your sites" />;
  if (sites.error) return <ErrorPanel error={sites.error} retry={() => sites.refetch()} />;
  if (!mine.length) return <Empty title="You work at no site yet.">An administrator adds you to a site; its shim shelf then shows here.</Empty>;
  return (
    <article className="flex flex-col gap-6">
      <PageHeader title="Shim stock">
        {mine.length > 1 && (
          <SelectField label="Site" value={siteId} onChange={(e) => setParams({ site: e.target.value })} className="w-56">
            {mine.map((s) => <option key={s.id} value={s.id}>{s.name}</option>)}
          </SelectField>
        )}
      </PageHeader>
      <section aria-labelledby="reorder" className="flex flex-col gap-2">
        <h2 id="reorder" className="text-xl font-bold">To order</h2>
        {reorder.isPending ? <Loading what="the reorder list" /> : reorder.error ? <ErrorPanel error={reorder.error} retry={() => reorder.refetch()} /> : <ReorderList items={reorder.data.items} />}
      </section>
      <div className="grid items-start gap-6 lg:grid-cols-[minmax(0,1fr)_26rem]">
        <section aria-labelledby="shelf" className="flex flex-col gap-2">
          <h2 id="shelf" className="text-xl font-bold">On the shelf</h2>
          <p className="text-ink-soft">Every size the fleet’s engines take. Shims taken out of an engine come back as used; a valve card takes used shims first.</p>
          {stock.isPending ? <Loading what="the shelf" /> : stock.error ? <ErrorPanel error={stock.error} retry={() => stock.refetch()} /> : <StockTable rows={rows} onPick={canAdjust ? pick : undefined} />}
        </section>
        {stock.data && (canAdjust || me.role === 'manager') && (
          <aside className="flex flex-col gap-4 lg:sticky lg:top-4">
            {canAdjust && <AdjustForm key={siteId} siteId={siteId} sizes={rows.map((r) => r.sizeMm)} size={size} onSize={setSize} />}
            {me.role === 'manager' && <MinimumForm key={`min-${siteId}`} siteId={siteId} rows={rows} size={size} onSize={setSize} />}
          </aside>
        )}
      </div>
      <SafetyNote />
    </article>
  );
}
