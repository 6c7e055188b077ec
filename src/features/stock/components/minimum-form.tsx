import { useState, type FormEvent } from 'react';
import { Button } from '../../../components/ui/button';
import { SelectField, TextField } from '../../../components/ui/field';
import { toast } from '../../../components/ui/toast';
import { ApiError } from '../../../lib/api-client';
import { StockMinSchema } from '../../../../shared/schemas/valves';
import { useSetMinimum } from '../api';
import { fmtSize, type SizeRow } from '../stock-rows';

/** The count below which a size joins the reorder list (new and used together). */
export function MinimumForm({ siteId, rows, size, onSize }: { siteId: string; rows: SizeRow[]; size: number | null; onSize: (mm: number) => void }) {
  const current = rows.find((r) => r.sizeMm === size)?.minCount ?? 0;
  const [text, setText] = useState<string | null>(null);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const setMin = useSetMinimum();
  const value = text ?? String(current);
  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = StockMinSchema.safeParse({ siteId, sizeMm: size ?? 0, minCount: Number(value) });
    if (!parsed.success) return setErrors(Object.fromEntries(parsed.error.issues.map((i) => [i.path.join('.'), i.message])));
    setErrors({});
    setMin.mutate(parsed.data, {
      onSuccess: () => {
        toast(`Minimum for ${fmtSize(parsed.data.sizeMm)} set to ${parsed.data.minCount}.`);
        setText(null);
      },
    });
  };
  const err = setMin.error instanceof ApiError ? setMin.error : null;
  return (
    <form onSubmit={submit} noValidate aria-labelledby="minimum-title" className="flex flex-col gap-4 rounded-card border-2 border-ink-line bg-paper-raised p-4">
      <h2 id="minimum-title" className="text-xl font-bold">Set a minimum</h2>
      <div className="flex flex-wrap items-end gap-4">
        <SelectField label="Size" value={size == null ? '' : String(size)} onChange={(e) => { onSize(Number(e.target.value)); setText(null); }} error={errors.sizeMm} className="num w-40 text-lg">
          <option value="" disabled>Choose</option>
          {rows.map((r) => <option key={r.sizeMm} value={String(r.sizeMm)}>{fmtSize(r.sizeMm)}</option>)}
        </SelectField>
        <TextField label="Keep at least" type="number" inputMode="numeric" min={0} max={1000} value={value} onChange={(e) => setText(e.target.value)} error={errors.minCount ?? err?.field('minCount')} suffix="shims" className="num w-44 text-lg" />
        <Button type="submit" className="min-h-14 px-6 text-lg" disabled={setMin.isPending}>{setMin.isPending ? 'Saving…' : 'Set minimum'}</Button>
      </div>
      {err && !err.details.length && <p role="alert" className="text-state-stop">⚠ {err.message}</p>}
    </form>
  );
}
