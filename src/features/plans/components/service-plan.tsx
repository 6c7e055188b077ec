import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { Button } from '../../../components/ui/button';
import { Empty } from '../../../components/ui/states';
import { settingsQueries } from '../../../lib/settings-queries';
import type { ModelDetail } from '../schemas';
import { SavedNote } from './recompute-note';
import { ServiceItemCard } from './service-item-card';
import { ServiceItemForm } from './service-item-form';

type Editing = { kind: 'none' } | { kind: 'new' } | { kind: 'item'; id: string };

/** The model's service items, each opened in place for editing. */
export function ServicePlan({ detail, canEdit }: { detail: ModelDetail; canEdit: boolean }) {
  const [editing, setEditing] = useState<Editing>({ kind: 'none' });
  const [saved, setSaved] = useState<{ id: string; bikes: number; what?: string } | null>(null);
  const settings = useQuery(settingsQueries.current());
  const tread = settings.data && { minMm: settings.data.settings.tyreTreadMinMm, source: settings.data.sources.tyreTreadMinMm };
  const modelId = detail.model.id;
  const done = (id: string, bikes: number) => {
    setEditing({ kind: 'none' });
    setSaved({ id, bikes });
  };
  const open = (e: Editing) => {
    setEditing(e);
    setSaved(null);
  };
  return (
    <section aria-labelledby="plan-heading" className="flex flex-col gap-3">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h2 id="plan-heading" className="text-xl font-bold">Service plan <span className="num font-normal text-ink-soft">({detail.items.length} {detail.items.length === 1 ? 'item' : 'items'})</span></h2>
        {canEdit && editing.kind !== 'new' && <Button onClick={() => open({ kind: 'new' })}>Add a service item</Button>}
      </div>
      {saved && !detail.items.some((i) => i.id === saved.id) && <SavedNote bikes={saved.bikes} what={saved.what} />}
      {editing.kind === 'new' && <ServiceItemForm modelId={modelId} item={null} bikes={detail.bikes} tread={tread} onSaved={done} onCancel={() => open({ kind: 'none' })} />}
      {detail.items.length === 0 && editing.kind !== 'new' && (
        <Empty title="No service items yet">{canEdit ? 'Add the first with “Add a service item”: oil, valves, chain, brakes…' : 'A fleet manager sets the plan for this model.'}</Empty>
      )}
      {detail.items.map((item) =>
        editing.kind === 'item' && editing.id === item.id ? (
          <ServiceItemForm key={item.id} modelId={modelId} item={item} bikes={detail.bikes} tread={tread} onSaved={done} onCancel={() => open({ kind: 'none' })} />
        ) : (
          <div key={item.id} className="flex flex-col gap-2">
            <ServiceItemCard modelId={modelId} item={item} bikes={detail.bikes} canEdit={canEdit} onEdit={() => open({ kind: 'item', id: item.id })} onRemoved={(bikes) => setSaved({ id: item.id, bikes, what: `Removed ${item.name}.` })} />
            {saved?.id === item.id && <SavedNote bikes={saved.bikes} />}
          </div>
        ),
      )}
    </section>
  );
}
