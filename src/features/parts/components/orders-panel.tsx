import { useQuery } from '@tanstack/react-query';
import { Button } from '../../../components/ui/button';
import { Empty, ErrorPanel, Loading } from '../../../components/ui/states';
import { toast } from '../../../components/ui/toast';
import type { Forecast } from '../../../../shared/schemas/parts';
import { partQueries, useDraftFromForecast } from '../api';
import { orderNumber } from '../parts-words';
import { OrderCard } from './order-card';
import { SuggestedOrders } from './suggested-orders';

interface Props {
  siteId: string;
  forecast: Forecast | undefined;
  forecastError: Error | null;
  canManage: boolean;
}

/** What to order from whom, and the site's purchase orders from draft to received. */
export function OrdersPanel({ siteId, forecast, forecastError, canManage }: Props) {
  const orders = useQuery(partQueries.orders(siteId));
  const catalogue = useQuery(partQueries.catalogue());
  const draft = useDraftFromForecast();
  const drafted = (n: number, numbers: string) => toast(n ? `Drafted ${numbers}. Check each one and send it.` : 'Nothing to draft: the forecast suggests no order.');
  return (
    <div className="flex flex-col gap-4">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h3 className="text-lg font-bold">Suggested, per supplier</h3>
        {canManage && (
          <Button disabled={draft.isPending} onClick={() => draft.mutate(siteId, { onSuccess: ({ items }) => drafted(items.length, items.map((o) => orderNumber(o.number)).join(', ')) })}>
            {draft.isPending ? 'Drafting…' : 'Draft orders from the forecast'}
          </Button>
        )}
      </div>
      {draft.error && <p role="alert" className="text-state-stop">⚠ {draft.error.message}</p>}
      {forecastError ? (
        <p className="text-ink-soft">The suggestions come from the forecast, which could not be loaded: {forecastError.message}</p>
      ) : !forecast || catalogue.isPending ? (
        <Loading what="the suggestions" />
      ) : catalogue.error ? (
        <ErrorPanel error={catalogue.error} retry={() => catalogue.refetch()} />
      ) : (
        <SuggestedOrders siteId={siteId} parts={forecast.parts} catalogue={catalogue.data.items} canManage={canManage} />
      )}
      <h3 className="text-lg font-bold">Purchase orders</h3>
      {orders.isPending ? (
        <Loading what="the purchase orders" />
      ) : orders.error ? (
        <ErrorPanel error={orders.error} retry={() => orders.refetch()} />
      ) : !orders.data.items.length ? (
        <Empty title="No purchase orders at this site yet.">{canManage ? 'Draft them from the forecast above.' : 'A manager drafts and sends them.'}</Empty>
      ) : (
        <div className="grid gap-4 xl:grid-cols-2">
          {orders.data.items.map((o) => <OrderCard key={o.id} order={o} canManage={canManage} />)}
        </div>
      )}
    </div>
  );
}
