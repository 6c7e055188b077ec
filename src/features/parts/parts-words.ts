import { format } from 'date-fns';
import { MOVEMENT_WORDS, formatQty, orderLabel, type OrderState, type PartFamily, type PartUnit } from '../../../shared/domain/parts';
import type { PurchaseOrder } from '../../../shared/schemas/parts';
import type { Tone } from '../../components/ui/tone-badge';

export const FAMILY_WORDS: Record<PartFamily, string> = {
  oil: 'Oil', filter: 'Filters', brakes: 'Brakes', tyres: 'Tyres', chain: 'Chain', fluid: 'Fluids', gasket: 'Gaskets and washers', plug: 'Plugs', other: 'Other',
};

export { MOVEMENT_WORDS };

export const ORDER_WORDS: Record<OrderState, { label: string; tone: Tone; icon: string }> = {
  draft: { label: 'Draft, not sent', tone: 'neutral', icon: '✎' },
  sent: { label: 'Sent, waiting for delivery', tone: 'info', icon: '→' },
  'part-received': { label: 'Partly received', tone: 'soon', icon: '◑' },
  received: { label: 'Received in full', tone: 'ok', icon: '✓' },
  cancelled: { label: 'Cancelled', tone: 'neutral', icon: '✕' },
};

export const orderNumber = orderLabel;

const money = new Intl.NumberFormat('en-GB', { style: 'currency', currency: 'GBP', minimumFractionDigits: 2, maximumFractionDigits: 2 });
export const formatPence = (pence: number) => money.format(pence / 100);

export const orderTotalPence = (o: Pick<PurchaseOrder, 'lines'>) => o.lines.reduce((s, l) => s + Math.round(l.quantity * l.unitCostPence), 0);

/** A movement's change with its sign, as the ledger books it: "+4 L", "−1 set". */
export const signedQty = (delta: number, unit: PartUnit) => `${delta < 0 ? '−' : '+'}${formatQty(Math.abs(delta), unit)}`;

/** A Monday as a week's short name: "14 Dec". */
export function weekLabel(day: string) {
  const [y, m, d] = day.split('-').map(Number);
  return format(new Date(y, m - 1, d), 'd MMM');
}

const figure = new Intl.NumberFormat('en-GB', { maximumFractionDigits: 2 });
/** A forecast figure without its unit, for a table whose part column already says it. */
export const formatFigure = (n: number) => figure.format(n);
