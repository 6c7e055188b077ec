import { useState, type FormEvent } from 'react';
import { useNavigate } from 'react-router-dom';
import { useQuery } from '@tanstack/react-query';
import { Button } from '../../../components/ui/button';
import { SelectField, TextField } from '../../../components/ui/field';
import { PageHeader } from '../../../components/ui/states';
import { ApiError } from '../../../lib/api-client';
import { referenceQueries } from '../../../lib/reference-queries';
import { BikeCreateSchema } from '../../../../shared/schemas/bikes';
import { useCreateBike } from '../api';

export function BikeNewRoute() {
  const navigate = useNavigate();
  const create = useCreateBike();
  const sites = useQuery(referenceQueries.sites());
  const models = useQuery(referenceQueries.models());
  const [form, setForm] = useState({ fleetNumber: '', registration: '', vin: '', modelId: '', siteId: '', odometerUnit: 'km', inServiceDate: new Date().toISOString().slice(0, 10), inServiceOdometer: '0' });
  const [errors, setErrors] = useState<Record<string, string>>({});
  const set = (k: keyof typeof form) => (e: { target: { value: string } }) => setForm({ ...form, [k]: e.target.value });
  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = BikeCreateSchema.safeParse({ ...form, inServiceOdometer: Number(form.inServiceOdometer) });
    if (!parsed.success) return setErrors(Object.fromEntries(parsed.error.issues.map((i) => [String(i.path[0]), i.message])));
    setErrors({});
    create.mutate(parsed.data, { onSuccess: (r) => navigate(`/fleet/${r.bike.id}`) });
  };
  const err = create.error instanceof ApiError ? create.error : null;
  const e = (k: string) => errors[k] ?? err?.field(k);
  return (
    <>
      <PageHeader title="Add a bike" />
      <form onSubmit={submit} noValidate className="grid max-w-3xl gap-4 rounded-card border-2 border-ink-line bg-paper-raised p-6 sm:grid-cols-2">
        <TextField label="Fleet number" value={form.fleetNumber} onChange={set('fleetNumber')} error={e('fleetNumber')} placeholder="SM-25" />
        <TextField label="Registration" value={form.registration} onChange={set('registration')} error={e('registration')} />
        <TextField label="VIN (optional)" value={form.vin} onChange={set('vin')} error={e('vin')} hint="17 characters; older bikes may have none." className="sm:col-span-2" />
        <SelectField label="Model" value={form.modelId} onChange={set('modelId')} error={e('modelId')}>
          <option value="">Choose a model</option>
          {models.data?.items.map((m) => <option key={m.id} value={m.id}>{m.name}</option>)}
        </SelectField>
        <SelectField label="Site" value={form.siteId} onChange={set('siteId')} error={e('siteId')}>
          <option value="">Choose a site</option>
          {sites.data?.items.map((s) => <option key={s.id} value={s.id}>{s.name}</option>)}
        </SelectField>
        <SelectField label="Odometer reads" value={form.odometerUnit} onChange={set('odometerUnit')}>
          <option value="km">kilometres (km)</option>
          <option value="mi">miles (mi)</option>
        </SelectField>
        <TextField label="In service since" type="date" value={form.inServiceDate} onChange={set('inServiceDate')} error={e('inServiceDate')} />
        <TextField label="Odometer when it entered service" inputMode="decimal" value={form.inServiceOdometer} onChange={set('inServiceOdometer')} error={e('inServiceOdometer')} suffix={form.odometerUnit} />
        {err && !err.details.length && <p role="alert" className="text-state-stop sm:col-span-2">{err.message}</p>}
        <div className="sm:col-span-2">
          <Button type="submit" disabled={create.isPending}>Add to the fleet</Button>
        </div>
      </form>
    </>
  );
}
