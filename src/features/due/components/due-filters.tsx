import { useQuery } from '@tanstack/react-query';
import { SelectField } from '../../../components/ui/field';
import { DUE_LABELS } from '../../../components/ui/status-badge';
import { referenceQueries } from '../../../lib/reference-queries';
import { DUE_STATUSES } from '../../../../shared/schemas/due';
import type { DueFilter } from '../api';

export const WINDOWS = [7, 14, 30] as const;

interface Props {
  filter: DueFilter;
  items: string[];
  onChange: (key: keyof DueFilter, value: string) => void;
}

export function DueFilters({ filter, items, onChange }: Props) {
  const sites = useQuery(referenceQueries.sites());
  const models = useQuery(referenceQueries.models());
  const set = (k: keyof DueFilter) => (e: { target: { value: string } }) => onChange(k, e.target.value);
  return (
    <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-5">
      <SelectField label="Site" value={filter.siteId ?? ''} onChange={set('siteId')}>
        <option value="">All my sites</option>
        {sites.data?.items.map((s) => <option key={s.id} value={s.id}>{s.name}</option>)}
      </SelectField>
      <SelectField label="Model" value={filter.modelId ?? ''} onChange={set('modelId')}>
        <option value="">All models</option>
        {models.data?.items.map((m) => <option key={m.id} value={m.id}>{m.name}</option>)}
      </SelectField>
      <SelectField label="Work" value={filter.item ?? ''} onChange={set('item')}>
        <option value="">All work</option>
        {items.map((i) => <option key={i} value={i}>{i}</option>)}
      </SelectField>
      <SelectField label="State" value={filter.status ?? ''} onChange={set('status')}>
        <option value="">Any state</option>
        {DUE_STATUSES.map((s) => <option key={s} value={s}>{DUE_LABELS[s]}</option>)}
      </SelectField>
      <SelectField label="Due within" value={String(filter.within)} onChange={set('within')}>
        {WINDOWS.map((w) => <option key={w} value={w}>{w} days</option>)}
      </SelectField>
    </div>
  );
}
