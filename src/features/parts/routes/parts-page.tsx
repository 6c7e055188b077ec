import { useState } from 'react';
import { useSearchParams } from 'react-router-dom';
import { useQuery } from '@tanstack/react-query';
import { SelectField } from '../../../components/ui/field';
import { Empty, ErrorPanel, Loading, PageHeader } from '../../../components/ui/states';
import { referenceQueries } from '../../../lib/reference-queries';
import { useMe } from '../../../lib/use-me';
import { FORECAST_WEEKS, partQueries } from '../api';
import { ForecastPanel } from '../components/forecast-panel';
import { MovementForm } from '../components/movement-form';
import { OrdersPanel } from '../components/orders-panel';
import { PartMinimumForm } from '../components/part-minimum-form';
import { PartStockTable } from '../components/part-stock-table';
import { RecentMovements } from '../components/recent-movements';

/** One site's parts: the shelf, movements and counts, the coming weeks' need, and purchase orders. */
export function PartsRoute() {
  const me = useMe();
  const [params, setParams] = useSearchParams();
  const sites = useQuery(referenceQueries.sites());
  const mine = (sites.data?.items ?? []).filter((s) => me.siteIds.includes(s.id));
  const siteId = params.get('site') && mine.some((s) => s.id === params.get('site')) ? params.get('site')! : (mine[0]?.id ?? '');
  const stock = useQuery(partQueries.stock(siteId));
  // The forecast is the slow answer: asked once the shelf has come, so the shelf never waits behind it.
  const forecast = useQuery({ ...partQueries.forecast(siteId), enabled: !!siteId && !stock.isPending });
  const [partId, setPartId] = useState('');
  const canManage = me.role === 'manager';
  const pick = (id: string) => {
    setPartId(id);
    document.getElementById('movement')?.scrollIntoView({ behavior: 'smooth', block: 'start' });
  };

  if (sites.isPending) return <Loading what="your sites" />;
  if (sites.error) return <ErrorPanel error={sites.error} retry={() => sites.refetch()} />;
  if (!mine.length) return <Empty title="You work at no site yet.">An administrator adds you to a site; its parts shelf then shows here.</Empty>;
  const items = stock.data?.items ?? [];
  return (
    <article className="flex flex-col gap-8">
      <PageHeader title="Parts and stock">
        {mine.length > 1 && (
          <SelectField label="Site" value={siteId} onChange={(e) => { setParams({ site: e.target.value }); setPartId(''); }} className="w-56">
            {mine.map((s) => <option key={s.id} value={s.id}>{s.name}</option>)}
          </SelectField>
        )}
      </PageHeader>
      <section aria-labelledby="shelf" className="flex flex-col gap-2">
        <h2 id="shelf" className="text-xl font-bold">Stock at the site</h2>
        {stock.isPending ? <Loading what="the shelf" /> : stock.error ? <ErrorPanel error={stock.error} retry={() => stock.refetch()} /> : <PartStockTable items={items} onPick={pick} />}
      </section>
      {/* What sits below the shelf shows once the shelf is there, and orders once the forecast is:
          nothing already on screen is pushed down when an answer arrives. */}
      {stock.data && (
        <section aria-labelledby="movements" className="flex flex-col gap-4">
          <h2 id="movements" className="sr-only">Movements</h2>
          <div className="grid items-start gap-6 lg:grid-cols-[minmax(0,1fr)_24rem]">
            <MovementForm key={siteId} siteId={siteId} items={items} otherSites={mine.filter((s) => s.id !== siteId)} partId={partId} onPart={setPartId} />
            {canManage && <PartMinimumForm key={`min-${siteId}`} siteId={siteId} items={items} partId={partId} onPart={setPartId} />}
          </div>
          <h3 className="text-lg font-bold">Recent movements</h3>
          <RecentMovements recent={stock.data.recent} items={items} />
        </section>
      )}
      {!stock.isPending && (
        <section aria-labelledby="forecast" className="flex flex-col gap-2">
          <h2 id="forecast" className="text-xl font-bold">Forecast, next {FORECAST_WEEKS} weeks</h2>
          {forecast.isPending ? <Loading what="the forecast" /> : forecast.error ? <ErrorPanel error={forecast.error} retry={() => forecast.refetch()} /> : <ForecastPanel key={siteId} forecast={forecast.data} />}
        </section>
      )}
      {!stock.isPending && !forecast.isPending && (
        <section aria-labelledby="orders" className="flex flex-col gap-2">
          <h2 id="orders" className="text-xl font-bold">Orders</h2>
          <OrdersPanel siteId={siteId} forecast={forecast.data} forecastError={forecast.error} canManage={canManage} />
        </section>
      )}
    </article>
  );
}
