import { useState, type FormEvent } from 'react';
import { Button } from '../../../components/ui/button';
import { SelectField, TextField } from '../../../components/ui/field';
import { toast } from '../../../components/ui/toast';
import { ApiError } from '../../../lib/api-client';
import { UNIT_WORDS, formatQty } from '../../../../shared/domain/parts';
import type { StockLine } from '../../../../shared/schemas/parts';
import { useSetPartMinimum } from '../api';

/** The level below which a part is flagged on the shelf and topped up by the suggested order. */
export function PartMinimumForm({ siteId, items, partId, onPart }: { siteId: string; items: StockLine[]; partId: string; onPart: (partId: string) => void }) {
  const part = items.find((p) => p.partId === partId);
  const [text, setText] = useState<{ partId: string; value: string } | null>(null);
  const [error, setError] = useState<string | undefined>();
  const setMin = useSetPartMinimum();
  const value = text?.partId === partId ? text.value : String(part?.minimum ?? '');
  const submit = (e: FormEvent) => {
    e.preventDefault();
    if (!part) return setError('Choose the part first.');
    const minimum = value.trim() === '' ? Number.NaN : Number(value);
    if (!Number.isFinite(minimum) || minimum < 0) return setError('Type the minimum as a number, zero or more.');
    setError(undefined);
    setMin.mutate(
      { siteId, partId, minimum },
      {
        onSuccess: () => {
          toast(`Minimum for ${part.name} set to ${formatQty(minimum, part.unit)}.`);
          setText(null);
        },
      },
    );
  };
  const err = setMin.error instanceof ApiError ? setMin.error : null;
  return (
    <form onSubmit={submit} noValidate aria-labelledby="part-minimum-title" className="flex flex-col gap-4 rounded-card border-2 border-ink-line bg-paper-raised p-4">
      <h2 id="part-minimum-title" className="text-xl font-bold">Set a minimum</h2>
      <SelectField label="Part" value={partId} onChange={(e) => onPart(e.target.value)} className="text-lg">
        <option value="" disabled>Choose a part</option>
        {items.map((p) => <option key={p.partId} value={p.partId}>{p.partNumber} · {p.name}</option>)}
      </SelectField>
      <div className="flex flex-wrap items-end gap-4">
        <TextField
          label="Keep at least" type="number" inputMode="decimal" min={0} step="any" value={value}
          onChange={(e) => setText({ partId, value: e.target.value })}
          error={error ?? err?.field('minimum')} suffix={part ? UNIT_WORDS[part.unit].many : undefined} className="num w-52 text-lg"
        />
        <Button type="submit" className="min-h-14 px-6 text-lg" disabled={setMin.isPending}>{setMin.isPending ? 'Saving…' : 'Set minimum'}</Button>
      </div>
      {setMin.error && !err?.field('minimum') && <p role="alert" className="text-state-stop">⚠ {setMin.error.message}</p>}
    </form>
  );
}
