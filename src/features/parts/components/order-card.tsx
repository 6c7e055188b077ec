import { useState } from 'react';
import { Button } from '../../../components/ui/button';
import { toast } from '../../../components/ui/toast';
import { ToneBadge } from '../../../components/ui/tone-badge';
import { formatDateTime } from '../../../lib/format';
import { formatQty, roundQty } from '../../../../shared/domain/parts';
import type { PurchaseOrder } from '../../../../shared/schemas/parts';
import { useOrderAction } from '../api';
import { ORDER_WORDS, formatPence, orderNumber, orderTotalPence } from '../parts-words';
import { ReceiveForm } from './receive-form';

function Dates({ o }: { o: PurchaseOrder }) {
  const parts = [`Drafted ${formatDateTime(o.createdAt)}`, o.sentAt && `sent ${formatDateTime(o.sentAt)}`, o.receivedAt && `received ${formatDateTime(o.receivedAt)}`];
  return <p className="num text-sm text-ink-soft">{parts.filter(Boolean).join(' · ')}</p>;
}

/** One purchase order: its lines, its cost and what can be done with it now. */
export function OrderCard({ order, canManage }: { order: PurchaseOrder; canManage: boolean }) {
  const [receiving, setReceiving] = useState(false);
  const [confirmCancel, setConfirmCancel] = useState(false);
  const send = useOrderAction('send');
  const cancel = useOrderAction('cancel');
  const number = orderNumber(order.number);
  const state = ORDER_WORDS[order.status];
  const canReceive = order.status === 'sent' || order.status === 'part-received';
  const act = { siteId: order.siteId, id: order.id };
  const failed = send.error ?? cancel.error;
  return (
    <article aria-labelledby={`order-${order.id}`} className="flex flex-col gap-3 rounded-card border-2 border-ink-line bg-paper-raised p-4">
      <header className="flex flex-wrap items-start justify-between gap-2">
        <div>
          <h3 id={`order-${order.id}`} className="text-lg font-bold"><span className="num">{number}</span> · {order.supplier.name}</h3>
          <Dates o={order} />
        </div>
        <ToneBadge tone={state.tone} icon={state.icon}>{state.label}</ToneBadge>
      </header>
      <table className="num w-full border-collapse text-left text-sm">
        <caption className="sr-only">Lines of {number}</caption>
        <thead className="bg-paper-sunk">
          <tr>
            <th scope="col" className="px-2 py-1">Part</th>
            <th scope="col" className="px-2 py-1">Ordered</th>
            <th scope="col" className="px-2 py-1">Received</th>
            <th scope="col" className="px-2 py-1">Unit cost</th>
            <th scope="col" className="px-2 py-1">Line cost</th>
          </tr>
        </thead>
        <tbody>
          {order.lines.map((l) => (
            <tr key={l.partId} className="border-t border-ink-line">
              <td className="px-2 py-1">{l.partNumber} · {l.name}</td>
              <td className="px-2 py-1">{formatQty(l.quantity, l.unit)}</td>
              <td className="px-2 py-1">{formatQty(l.received, l.unit)}{l.received > 0 && l.received < l.quantity && <span className="text-ink-soft">, {formatQty(roundQty(l.quantity - l.received), l.unit)} to come</span>}</td>
              <td className="px-2 py-1">{formatPence(l.unitCostPence)}</td>
              <td className="px-2 py-1">{formatPence(Math.round(l.quantity * l.unitCostPence))}</td>
            </tr>
          ))}
        </tbody>
        <tfoot>
          <tr className="border-t-2 border-ink-line font-bold">
            <th scope="row" colSpan={4} className="px-2 py-1 text-right">Total</th>
            <td className="px-2 py-1">{formatPence(orderTotalPence(order))}</td>
          </tr>
        </tfoot>
      </table>
      {order.note && <p className="text-sm">Note: {order.note}</p>}
      {failed && <p role="alert" className="text-state-stop">⚠ {failed.message}</p>}
      {!receiving && (
        <div className="flex flex-wrap gap-2">
          {canManage && order.status === 'draft' && (
            <Button disabled={send.isPending} onClick={() => send.mutate(act, { onSuccess: () => toast(`${number} sent to ${order.supplier.name} (${order.supplier.email}).`) })}>
              {send.isPending ? 'Sending…' : `Send to ${order.supplier.name}`}
            </Button>
          )}
          {canReceive && <Button onClick={() => setReceiving(true)}>Receive</Button>}
          {canManage && (order.status === 'draft' || order.status === 'sent') &&
            (confirmCancel ? (
              <>
                <Button kind="danger" disabled={cancel.isPending} onClick={() => cancel.mutate(act, { onSuccess: () => toast(`${number} cancelled.`) })}>
                  {cancel.isPending ? 'Cancelling…' : `Yes, cancel ${number}`}
                </Button>
                <Button kind="secondary" onClick={() => setConfirmCancel(false)}>Keep it</Button>
              </>
            ) : (
              <Button kind="secondary" onClick={() => setConfirmCancel(true)}>Cancel order</Button>
            ))}
        </div>
      )}
      {receiving && <ReceiveForm order={order} onDone={() => setReceiving(false)} />}
    </article>
  );
}
