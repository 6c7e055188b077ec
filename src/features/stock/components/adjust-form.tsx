import { useState, type FormEvent } from 'react';
import { Button } from '../../../components/ui/button';
import { SelectField, TextField } from '../../../components/ui/field';
import { Segmented } from '../../../components/ui/segmented';
import { toast } from '../../../components/ui/toast';
import { ApiError } from '../../../lib/api-client';
import { StockAdjustSchema } from '../../../../shared/schemas/valves';
import { useAdjustStock } from '../api';
import { fmtSize } from '../stock-rows';

interface Props {
  siteId: string;
  sizes: number[];
  size: number | null;
  onSize: (mm: number) => void;
}

const REASONS = ['Delivery', 'Counted the shelf', 'Damaged, thrown away', 'Ground to size', 'Lent to the other site'];

/** A count changes only with a reason, so the shelf's history can be read back. */
export function AdjustForm({ siteId, sizes, size, onSize }: Props) {
  const [condition, setCondition] = useState<'new' | 'used'>('new');
  const [direction, setDirection] = useState<'add' | 'take'>('add');
  const [count, setCount] = useState('1');
  const [reason, setReason] = useState('');
  const [errors, setErrors] = useState<Record<string, string>>({});
  const adjust = useAdjustStock();
  const submit = (e: FormEvent) => {
    e.preventDefault();
    const n = Number(count);
    const parsed = StockAdjustSchema.safeParse({ siteId, sizeMm: size ?? 0, condition, delta: direction === 'add' ? n : -n, reason });
    if (!parsed.success) return setErrors(Object.fromEntries(parsed.error.issues.map((i) => [i.path.join('.'), i.message])));
    setErrors({});
    adjust.mutate(parsed.data, {
      onSuccess: () => {
        toast(`${direction === 'add' ? 'Added' : 'Took out'} ${n} × ${fmtSize(parsed.data.sizeMm)} (${condition}): ${parsed.data.reason}.`);
        setReason('');
        setCount('1');
      },
    });
  };
  const err = adjust.error instanceof ApiError ? adjust.error : null;
  return (
    <form id="adjust" onSubmit={submit} noValidate aria-labelledby="adjust-title" className="flex flex-col gap-4 rounded-card border-2 border-accent bg-paper-raised p-4">
      <h2 id="adjust-title" className="text-xl font-bold">Change a count</h2>
      <div className="flex flex-wrap items-end gap-4">
        <SelectField label="Size" value={size == null ? '' : String(size)} onChange={(e) => onSize(Number(e.target.value))} error={errors.sizeMm ?? err?.field('sizeMm')} className="num w-40 text-lg">
          <option value="" disabled>Choose</option>
          {sizes.map((s) => <option key={s} value={String(s)}>{fmtSize(s)}</option>)}
        </SelectField>
        <Segmented legend="Condition" value={condition} onChange={setCondition} options={[{ value: 'new', label: 'New' }, { value: 'used', label: 'Used' }]} />
        <Segmented legend="Change" value={direction} onChange={setDirection} options={[{ value: 'add', label: '+ Add' }, { value: 'take', label: '− Take out' }]} />
        <TextField label="How many" type="number" inputMode="numeric" min={1} max={1000} value={count} onChange={(e) => setCount(e.target.value)} error={errors.delta ?? err?.field('delta')} className="num w-32 text-lg" />
      </div>
      <TextField label="Why" list="stock-reasons" value={reason} onChange={(e) => setReason(e.target.value)} error={errors.reason ?? err?.field('reason')} hint="e.g. a delivery, a count of the shelf, a damaged shim." className="text-lg" />
      <datalist id="stock-reasons">{REASONS.map((r) => <option key={r} value={r} />)}</datalist>
      {err && !err.details.length && <p role="alert" className="text-state-stop">⚠ {err.message}</p>}
      <Button type="submit" className="min-h-14 self-start px-8 text-lg" disabled={adjust.isPending}>{adjust.isPending ? 'Saving…' : 'Save the change'}</Button>
    </form>
  );
}
