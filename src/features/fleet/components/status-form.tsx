import { useState, type FormEvent } from 'react';
import { Button } from '../../../components/ui/button';
import { SelectField, TextField } from '../../../components/ui/field';
import { ApiError } from '../../../lib/api-client';
import { useMe } from '../../../lib/use-me';
import { BIKE_STATUSES, BIKE_STATUS_LABELS, type BikeStatus, type BikeSummary } from '../../../../shared/schemas/bikes';
import { useChangeStatus } from '../api';

export function StatusForm({ bike }: { bike: BikeSummary }) {
  const me = useMe();
  const change = useChangeStatus(bike.id);
  const [status, setStatus] = useState<BikeStatus>(bike.status);
  const [reason, setReason] = useState(bike.statusReason ?? '');
  const options = BIKE_STATUSES.filter((s) => s !== 'retired' || me.role !== 'technician');
  const submit = (e: FormEvent) => {
    e.preventDefault();
    change.mutate({ status, reason });
  };
  const err = change.error instanceof ApiError ? change.error : null;
  return (
    <form onSubmit={submit} className="flex flex-wrap items-end gap-3 rounded-card border-2 border-ink-line bg-paper-raised p-4" aria-label="Change state">
      <SelectField label="Change state" value={status} onChange={(e) => setStatus(e.target.value as BikeStatus)} className="min-w-48">
        {options.map((s) => <option key={s} value={s}>{BIKE_STATUS_LABELS[s]}</option>)}
      </SelectField>
      {status !== 'in_service' && (
        <TextField label="Reason" value={reason} onChange={(e) => setReason(e.target.value)} className="min-w-72 flex-1" error={err?.field('reason')} placeholder="e.g. rear tyre below the tread limit" />
      )}
      <Button type="submit" disabled={change.isPending || (status === bike.status && reason === (bike.statusReason ?? ''))}>
        Save state
      </Button>
      {err && !err.field('reason') && <p role="alert" className="w-full text-state-stop">{err.message}</p>}
    </form>
  );
}
