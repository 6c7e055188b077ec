import { Link } from 'react-router-dom';
import { formatQty } from '../../../../shared/domain/parts';
import type { Shortage } from '../../../../shared/schemas/parts';
import { ORDER_WORDS, orderNumber, weekLabel } from '../parts-words';

/** Parts that run out before a delivery ordered today could arrive, each with what is being done about it. */
export function ShortageList({ items }: { items: Shortage[] }) {
  if (!items.length) return <p className="rounded-card border-2 border-dashed border-ink-line p-4 text-ink-soft">✓ Every part lasts until an order placed today would arrive.</p>;
  return (
    <ul className="divide-y divide-ink-line rounded-card border-2 border-state-soon bg-paper-raised">
      {items.map((s) => (
        <li key={`${s.siteId}:${s.partId}`} className="flex flex-wrap items-baseline gap-x-4 gap-y-1 px-4 py-3">
          <span aria-hidden className="font-black text-ink">◔</span>
          <Link to={`/parts?site=${s.siteId}`} className="font-bold text-accent underline-offset-4 hover:underline">
            {s.name}
          </Link>
          <span className="text-ink-soft">
            <span className="num">{s.partNumber}</span> · {s.siteName}
          </span>
          <span className="min-w-64 flex-1">
            {formatQty(s.onHand, s.unit)} on the shelf{s.onOrder > 0 ? `, ${formatQty(s.onOrder, s.unit)} on order` : ''}; runs out {s.runsOutWeek ? `the week of ${weekLabel(s.runsOutWeek)}` : 'soon'}, and the supplier needs {s.leadTimeDays} days.
          </span>
          <span className="text-sm">
            {s.orders.length
              ? s.orders.map((o) => `${orderNumber(o.number)}: ${ORDER_WORDS[o.status].label.toLowerCase()}`).join('; ')
              : `No order yet: about ${formatQty(s.suggested, s.unit)} suggested.`}
          </span>
        </li>
      ))}
    </ul>
  );
}
