import { useState, type FormEvent } from 'react';
import { useNavigate } from 'react-router-dom';
import { Button } from '../../../components/ui/button';
import { SelectField, TextField } from '../../../components/ui/field';
import { Segmented } from '../../../components/ui/segmented';
import { ApiError } from '../../../lib/api-client';
import { ModelUpsertSchema } from '../../../../shared/schemas/plans';
import type { ModelSummary } from '../../../../shared/schemas/reference';
import { useCreateModel, useUpdateModel } from '../api';
import { ADJUSTER_LABELS, engineWords } from '../engine-words';
import { detailErrors, fieldErrors, type Errors } from '../form-values';
import { BLANK_MODEL, modelInput, modelValues, type ModelValues } from '../model-values';
import { RecomputeNote, SavedNote } from './recompute-note';
import { ShimRange } from './shim-range';

const range = (n: number) => Array.from({ length: n }, (_, i) => String(i + 1));
const ADJUSTERS = (Object.keys(ADJUSTER_LABELS) as ModelSummary['adjuster'][]).map((value) => ({ value, label: ADJUSTER_LABELS[value] }));

/** Engine layout and valve specs of a model; a new model is created here, an existing one updated. */
export function ModelForm({ model, bikes, canEdit }: { model: ModelSummary | null; bikes: number; canEdit: boolean }) {
  const navigate = useNavigate();
  const create = useCreateModel();
  const update = useUpdateModel(model?.id ?? '');
  const save = model ? update : create;
  const [v, setV] = useState<ModelValues>(() => (model ? modelValues(model) : BLANK_MODEL));
  const [errors, setErrors] = useState<Errors>({});
  const [saved, setSaved] = useState<number | undefined | null>(null);
  const set = (k: keyof ModelValues, value: string) => {
    setV((old) => ({ ...old, [k]: value }));
    setSaved(null);
  };
  const serverErr = save.error instanceof ApiError ? save.error : null;
  const err = (path: string) => errors[path];

  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = ModelUpsertSchema.safeParse(modelInput(v));
    if (!parsed.success) return setErrors(fieldErrors(parsed.error, (p) => v[p as keyof ModelValues]));
    setErrors({});
    save.mutate(parsed.data, {
      onSuccess: (d) => (model ? setSaved(d.bikesRecomputed) : navigate(`/plans/${d.model.id}`, { replace: true, state: { created: true } })),
      onError: (x) => x instanceof ApiError && setErrors(detailErrors(x.details)),
    });
  };

  const engine = { cylinders: Number(v.cylinders), intakeValvesPerCylinder: Number(v.intakeValvesPerCylinder), exhaustValvesPerCylinder: Number(v.exhaustValvesPerCylinder) };
  return (
    <form onSubmit={submit} noValidate aria-labelledby="engine-heading" className="flex flex-col gap-4 rounded-card border-2 border-ink-line bg-paper-raised p-5">
      <h2 id="engine-heading" className="text-xl font-bold">Engine and valve clearances</h2>
      <fieldset disabled={!canEdit} className="flex flex-col gap-4">
        <TextField label="Model name" value={v.name} onChange={(e) => set('name', e.target.value)} error={err('name')} placeholder="e.g. Harrier 300" className="max-w-md" />
        <div className="grid gap-4 sm:grid-cols-3">
          <SelectField label="Cylinders" value={v.cylinders} onChange={(e) => set('cylinders', e.target.value)} error={err('cylinders')}>
            {range(8).map((n) => <option key={n} value={n}>{n}</option>)}
          </SelectField>
          <SelectField label="Intake valves per cylinder" value={v.intakeValvesPerCylinder} onChange={(e) => set('intakeValvesPerCylinder', e.target.value)} error={err('intakeValvesPerCylinder')}>
            {range(3).map((n) => <option key={n} value={n}>{n}</option>)}
          </SelectField>
          <SelectField label="Exhaust valves per cylinder" value={v.exhaustValvesPerCylinder} onChange={(e) => set('exhaustValvesPerCylinder', e.target.value)} error={err('exhaustValvesPerCylinder')}>
            {range(3).map((n) => <option key={n} value={n}>{n}</option>)}
          </SelectField>
        </div>
        <p className="text-ink-soft">{engineWords(engine)}</p>
        <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
          <TextField label="Intake, smallest" inputMode="decimal" suffix="mm" value={v.intakeMinMm} onChange={(e) => set('intakeMinMm', e.target.value)} error={err('intakeMinMm')} placeholder="e.g. 0.10" />
          <TextField label="Intake, largest" inputMode="decimal" suffix="mm" value={v.intakeMaxMm} onChange={(e) => set('intakeMaxMm', e.target.value)} error={err('intakeMaxMm')} placeholder="e.g. 0.15" />
          <TextField label="Exhaust, smallest" inputMode="decimal" suffix="mm" value={v.exhaustMinMm} onChange={(e) => set('exhaustMinMm', e.target.value)} error={err('exhaustMinMm')} placeholder="e.g. 0.17" />
          <TextField label="Exhaust, largest" inputMode="decimal" suffix="mm" value={v.exhaustMaxMm} onChange={(e) => set('exhaustMaxMm', e.target.value)} error={err('exhaustMaxMm')} placeholder="e.g. 0.22" />
        </div>
        <p className="-mt-2 text-sm text-ink-muted">Clearances measured cold, as the maker’s service manual gives them.</p>
        <Segmented legend="Adjuster" value={v.adjuster} options={ADJUSTERS} onChange={(a) => set('adjuster', a)} />
        {v.adjuster === 'shim-under-bucket' && <ShimRange min={v.shimMinMm} max={v.shimMaxMm} step={v.shimStepMm} onChange={set} error={err} />}
      </fieldset>
      {canEdit && (
        <div className="flex flex-col gap-3 border-t border-ink-line pt-4">
          {model && (saved !== null ? <SavedNote bikes={saved} /> : <RecomputeNote bikes={bikes} />)}
          {serverErr && !serverErr.details.length && <p role="alert" className="text-state-stop">⚠ {serverErr.message}</p>}
          {Object.keys(errors).length > 0 && <p role="alert" className="font-semibold text-state-stop">⚠ Nothing was saved: correct the fields marked above. What you typed is kept.</p>}
          <div>
            <Button type="submit" disabled={save.isPending}>{save.isPending ? 'Saving…' : model ? 'Save engine and valve specs' : 'Add the model'}</Button>
          </div>
        </div>
      )}
    </form>
  );
}
