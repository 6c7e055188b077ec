import { useState, type FormEvent } from 'react';
import { Button } from '../../../components/ui/button';
import { CheckField } from '../../../components/ui/check-field';
import { SelectField, TextField } from '../../../components/ui/field';
import { ApiError } from '../../../lib/api-client';
import { CATEGORY_LABELS, SERVICE_CATEGORIES, ServiceItemUpsertSchema } from '../../../../shared/schemas/plans';
import { useSaveItem } from '../api';
import { detailErrors, fieldErrors, typedAt, type Errors } from '../form-values';
import { BLANK_ITEM, itemInput, itemValues, type ItemValues } from '../item-values';
import type { PlanItem } from '../schemas';
import { ReadingRows } from './reading-rows';
import { RecomputeNote } from './recompute-note';
import { RuleField } from './rule-field';
import type { TreadSetting } from './tread-default';

interface Props {
  modelId: string;
  item: PlanItem | null;
  bikes: number;
  tread: TreadSetting | undefined;
  onSaved: (itemId: string, bikesRecomputed: number) => void;
  onCancel: () => void;
}

/** One service item: what is done, how often (whichever comes first), and what is recorded at sign-off. */
export function ServiceItemForm({ modelId, item, bikes, tread, onSaved, onCancel }: Props) {
  const save = useSaveItem(modelId, item?.id ?? null);
  const [v, setV] = useState<ItemValues>(() => (item ? itemValues(item) : BLANK_ITEM));
  const [errors, setErrors] = useState<Errors>({});
  const set = <K extends keyof ItemValues>(k: K, value: ItemValues[K]) => setV((old) => ({ ...old, [k]: value }));
  const err = (path: string) => errors[path];
  const serverErr = save.error instanceof ApiError ? save.error : null;

  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = ServiceItemUpsertSchema.safeParse(itemInput(v));
    if (!parsed.success) return setErrors(fieldErrors(parsed.error, (p) => typedAt(v, p)));
    setErrors({});
    save.mutate(parsed.data, {
      onSuccess: (d) => onSaved(d.id ?? item?.id ?? '', d.bikesRecomputed),
      onError: (x) => x instanceof ApiError && setErrors(detailErrors(x.details)),
    });
  };

  return (
    <form onSubmit={submit} noValidate aria-label={item ? `Edit ${item.name}` : 'New service item'} className="flex flex-col gap-4 rounded-card border-2 border-accent bg-paper-raised p-5">
      <div className="grid gap-4 md:grid-cols-3">
        <TextField label="Service item" value={v.name} onChange={(e) => set('name', e.target.value)} error={err('name')} placeholder="e.g. Chain slack and lube" className="md:col-span-2" />
        <SelectField label="Kind of work" value={v.category} onChange={(e) => set('category', e.target.value as ItemValues['category'])} error={err('category')}>
          {SERVICE_CATEGORIES.map((c) => <option key={c} value={c}>{CATEGORY_LABELS[c]}</option>)}
        </SelectField>
      </div>
      <fieldset className="grid gap-4 md:grid-cols-3">
        <legend className="mb-1 text-lg font-semibold">How often: whichever comes first</legend>
        <TextField label="Every (distance)" inputMode="numeric" suffix="km" value={v.everyKm} onChange={(e) => set('everyKm', e.target.value)} error={err('everyKm')} placeholder="e.g. 5000" />
        <TextField label="Every (time)" inputMode="numeric" suffix="months" value={v.everyMonths} onChange={(e) => set('everyMonths', e.target.value)} error={err('everyMonths')} placeholder="e.g. 12" />
        <TextField label="First at (running-in)" inputMode="numeric" suffix="km" value={v.firstAtKm} onChange={(e) => set('firstAtKm', e.target.value)} error={err('firstAtKm')} placeholder="e.g. 1000" hint="Once, after entering service." />
        <div className="md:col-span-3">
          <RuleField value={v.rrule} onChange={(r) => set('rrule', r)} error={err('rrule')} />
        </div>
      </fieldset>
      <div className="grid gap-4 md:grid-cols-3">
        <TextField label="Takes about" inputMode="numeric" suffix="min" value={v.estimatedMinutes} onChange={(e) => set('estimatedMinutes', e.target.value)} error={err('estimatedMinutes')} />
        <CheckField
          label="Safety-critical"
          hint="Overdue, the bike may not go out."
          checked={v.safetyCritical}
          onChange={(e) => set('safetyCritical', e.target.checked)}
          className="self-end md:col-span-2"
        />
      </div>
      <ReadingRows rows={v.readings} onChange={(r) => set('readings', r)} error={err} tread={tread} />
      <div className="flex flex-col gap-3 border-t border-ink-line pt-4">
        <RecomputeNote bikes={bikes} />
        {serverErr && !serverErr.details.length && <p role="alert" className="text-state-stop">⚠ {serverErr.message}</p>}
        {Object.keys(errors).length > 0 && <p role="alert" className="font-semibold text-state-stop">⚠ Nothing was saved: correct the fields marked above. What you typed is kept.</p>}
        <div className="flex flex-wrap gap-3">
          <Button type="submit" disabled={save.isPending}>{save.isPending ? 'Saving…' : item ? 'Save this item' : 'Add this item'}</Button>
          <Button kind="secondary" onClick={onCancel}>{item ? 'Close without saving' : 'Cancel'}</Button>
        </div>
      </div>
    </form>
  );
}
