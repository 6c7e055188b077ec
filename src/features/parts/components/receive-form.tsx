import { useState, type FormEvent } from 'react';
import { Button } from '../../../components/ui/button';
import { TextField } from '../../../components/ui/field';
import { toast } from '../../../components/ui/toast';
import { UNIT_WORDS, roundQty } from '../../../../shared/domain/parts';
import { PurchaseOrderReceiveSchema, type PurchaseOrder } from '../../../../shared/schemas/parts';
import { useReceiveOrder } from '../api';
import { orderNumber } from '../parts-words';

const due = (l: PurchaseOrder['lines'][number]) => roundQty(l.quantity - l.received);

/** What came in against an order, line by line, pre-filled with what is still due. */
export function ReceiveForm({ order, onDone }: { order: PurchaseOrder; onDone: () => void }) {
  const open = order.lines.filter((l) => due(l) > 0);
  const [arrived, setArrived] = useState<Record<string, string>>(() => Object.fromEntries(open.map((l) => [l.partId, String(due(l))])));
  const [note, setNote] = useState('');
  const [error, setError] = useState<string | null>(null);
  const receive = useReceiveOrder();
  const submit = (e: FormEvent) => {
    e.preventDefault();
    const lines = open.map((l) => ({ partId: l.partId, quantity: (arrived[l.partId] ?? '').trim() === '' ? 0 : Number(arrived[l.partId]) })).filter((l) => l.quantity !== 0);
    const parsed = PurchaseOrderReceiveSchema.safeParse({ lines, note: note.trim() || undefined });
    if (!parsed.success) return setError(parsed.error.issues[0].message);
    setError(null);
    receive.mutate(
      { siteId: order.siteId, id: order.id, receipt: parsed.data },
      {
        onSuccess: ({ order: o }) => {
          toast(`${orderNumber(o.number)}: booked in. ${o.status === 'received' ? 'Everything has arrived.' : 'Some is still to come.'}`);
          onDone();
        },
      },
    );
  };
  const message = error ?? receive.error?.message;
  return (
    <form onSubmit={submit} noValidate aria-label={`Receive ${orderNumber(order.number)}`} className="flex flex-col gap-3 border-t-2 border-ink-line pt-3">
      <div className="flex flex-wrap items-end gap-4">
        {open.map((l) => (
          <TextField
            key={l.partId} label={`${l.name} arrived`} type="number" inputMode="decimal" min={0} step="any"
            value={arrived[l.partId] ?? ''} onChange={(e) => setArrived({ ...arrived, [l.partId]: e.target.value })}
            suffix={UNIT_WORDS[l.unit].many} hint={`${due(l)} still due`} className="num w-56"
          />
        ))}
      </div>
      <TextField label="Note" value={note} onChange={(e) => setNote(e.target.value)} hint="e.g. the delivery note number" />
      {message && <p role="alert" className="text-state-stop">⚠ {message}</p>}
      <div className="flex flex-wrap gap-2">
        <Button type="submit" disabled={receive.isPending}>{receive.isPending ? 'Booking in…' : 'Book in what arrived'}</Button>
        <Button kind="secondary" onClick={onDone}>Close</Button>
      </div>
    </form>
  );
}
