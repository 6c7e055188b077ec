import { useState } from 'react';
import { Button } from '../../../components/ui/button';
import { TextField } from '../../../components/ui/field';
import { toast } from '../../../components/ui/toast';
import { formatQty } from '../../../../shared/domain/parts';
import { PurchaseOrderCreateSchema, type ForecastPart, type Part } from '../../../../shared/schemas/parts';
import { useCreateOrder } from '../api';
import { formatPence, orderNumber } from '../parts-words';

interface Group {
  supplier: { id: string; name: string } | null;
  lines: { part: ForecastPart; costPence: number; packSize: number }[];
}

/** The forecast's cautious suggestions, one group per supplier as the catalogue names it. */
export function supplierGroups(parts: ForecastPart[], catalogue: Part[]): Group[] {
  const byId = new Map(catalogue.map((p) => [p.id, p]));
  const groups = new Map<string, Group>();
  for (const part of parts.filter((p) => p.suggested.quantity > 0)) {
    const c = byId.get(part.partId);
    const key = c?.supplier?.id ?? '';
    const g = groups.get(key) ?? { supplier: c?.supplier ?? null, lines: [] };
    g.lines.push({ part, costPence: c?.unitCostPence ?? 0, packSize: c?.packSize ?? 1 });
    groups.set(key, g);
  }
  // Parts with no supplier last: nobody can be sent their order.
  return [...groups.values()].sort((a, b) => (a.supplier ? (b.supplier ? a.supplier.name.localeCompare(b.supplier.name) : -1) : 1));
}

function SupplierSuggestion({ siteId, group, canManage }: { siteId: string; group: Group; canManage: boolean }) {
  const [typed, setTyped] = useState<Record<string, string>>({});
  const [error, setError] = useState<string | null>(null);
  const create = useCreateOrder();
  const qty = (l: Group['lines'][number]) => typed[l.part.partId] ?? String(l.part.suggested.quantity);
  const draft = () => {
    if (!group.supplier) return;
    const lines = group.lines.map((l) => ({ partId: l.part.partId, quantity: qty(l).trim() === '' ? 0 : Number(qty(l)) })).filter((l) => l.quantity !== 0);
    const parsed = PurchaseOrderCreateSchema.safeParse({ siteId, supplierId: group.supplier.id, lines });
    if (!parsed.success) {
      const issue = parsed.error.issues[0];
      const line = typeof issue.path[1] === 'number' ? group.lines.find((l) => l.part.partId === lines[issue.path[1] as number].partId) : undefined;
      return setError(line ? `${line.part.name}: ${issue.message}` : issue.message);
    }
    setError(null);
    create.mutate(parsed.data, { onSuccess: ({ order }) => toast(`${orderNumber(order.number)} drafted for ${order.supplier.name}. Check it and send it below.`) });
  };
  const name = group.supplier?.name ?? 'No supplier set';
  const message = error ?? create.error?.message;
  return (
    <section aria-label={`Suggested order: ${name}`} className="flex flex-col gap-2 rounded-card border-2 border-ink-line bg-paper-raised p-3">
      <h3 className="font-bold">{name}</h3>
      {!group.supplier && <p className="text-sm text-ink-soft">Set a supplier for these parts in the catalogue to order them here.</p>}
      <table className="num w-full border-collapse text-left text-sm">
        <caption className="sr-only">Suggested order lines for {name}</caption>
        <thead className="bg-paper-sunk">
          <tr>
            <th scope="col" className="px-2 py-1">Part</th>
            <th scope="col" className="px-2 py-1">Need over the lead time</th>
            <th scope="col" className="px-2 py-1">Order</th>
            <th scope="col" className="px-2 py-1">Cost</th>
          </tr>
        </thead>
        <tbody>
          {group.lines.map((l) => (
            <tr key={l.part.partId} className="border-t border-ink-line">
              <td className="px-2 py-1">{l.part.partNumber} · {l.part.name}</td>
              <td className="px-2 py-1">{formatQty(l.part.suggested.leadTimeNeed, l.part.unit)} in {l.part.leadTimeDays} days</td>
              <td className="px-2 py-1">
                {canManage && group.supplier ? (
                  <TextField label={`Order of ${l.part.name}`} type="number" inputMode="decimal" min={0} step={l.packSize} value={qty(l)}
                    onChange={(e) => setTyped({ ...typed, [l.part.partId]: e.target.value })} hint={`Suggested: ${l.part.suggested.packs} ${l.part.suggested.packs === 1 ? 'pack' : 'packs'} of ${formatQty(l.packSize, l.part.unit)}`} className="w-40 [&_label]:sr-only" />
                ) : (
                  `${formatQty(l.part.suggested.quantity, l.part.unit)} (${l.part.suggested.packs} ${l.part.suggested.packs === 1 ? 'pack' : 'packs'})`
                )}
              </td>
              <td className="px-2 py-1">{formatPence(Math.round(Number(qty(l)) * l.costPence) || 0)}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {message && <p role="alert" className="text-state-stop">⚠ {message}</p>}
      {canManage && group.supplier && (
        <Button kind="secondary" className="self-start" onClick={draft} disabled={create.isPending}>{create.isPending ? 'Drafting…' : `Draft an order to ${group.supplier.name}`}</Button>
      )}
    </section>
  );
}

/** What to order now so the cautious need over each lead time and the minimum are covered. */
export function SuggestedOrders({ siteId, parts, catalogue, canManage }: { siteId: string; parts: ForecastPart[]; catalogue: Part[]; canManage: boolean }) {
  const groups = supplierGroups(parts, catalogue);
  if (!groups.length) return <p className="rounded-card border-2 border-dashed border-ink-line p-4 text-ink-soft">Nothing to order: the shelf and open orders cover the cautious need and every minimum.</p>;
  return (
    <div className="grid gap-3 lg:grid-cols-2">
      {groups.map((g) => <SupplierSuggestion key={g.supplier?.id ?? 'none'} siteId={siteId} group={g} canManage={canManage} />)}
    </div>
  );
}
