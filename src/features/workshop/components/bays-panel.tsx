import { useState } from 'react';
import { Button } from '../../../components/ui/button';
import { TextField } from '../../../components/ui/field';
import type { CapacitySite } from '../../../../shared/schemas/capacity';
import { useAddBay, usePatchBay, useRemoveBay } from '../api';
import { Problem } from './problem';

/** The site's bays in order: rename, move up, remove, add one at the end. */
export function BaysPanel({ site }: { site: CapacitySite }) {
  const add = useAddBay();
  const patch = usePatchBay();
  const remove = useRemoveBay();
  const [names, setNames] = useState<Record<string, string>>({});
  const error = add.error ?? patch.error ?? remove.error;
  return (
    <section aria-labelledby={`bays-${site.id}`} className="rounded-card border-2 border-ink-line bg-paper-raised p-4">
      <h2 id={`bays-${site.id}`} className="text-xl font-bold">
        Bays <span className="tabular-nums text-ink-soft">({site.bays.length})</span>
      </h2>
      {site.bays.length === 0 && <p className="mt-2 text-ink-soft">No bays yet: nothing can be planned here until a bay is added.</p>}
      <ol className="mt-3 space-y-3">
        {site.bays.map((b, i) => {
          const name = names[b.id] ?? b.name;
          return (
            <li key={b.id} className="flex flex-wrap items-end gap-2">
              <TextField label={`Bay ${i + 1} name`} value={name} maxLength={120} onChange={(e) => setNames({ ...names, [b.id]: e.target.value })} className="min-w-48 flex-1" />
              <Button kind="secondary" disabled={name.trim() === b.name || !name.trim() || patch.isPending} onClick={() => patch.mutate({ id: b.id, name: name.trim() })}>
                Rename
              </Button>
              <Button kind="secondary" disabled={i === 0 || patch.isPending} onClick={() => patch.mutate({ id: b.id, position: i })} aria-label={`Move ${b.name} up`}>
                ↑ Up
              </Button>
              <Button kind="danger" disabled={remove.isPending} onClick={() => remove.mutate(b.id)} aria-label={`Remove ${b.name}`}>
                Remove
              </Button>
            </li>
          );
        })}
      </ol>
      <Button className="mt-3" disabled={add.isPending} onClick={() => add.mutate({ siteId: site.id })}>
        + Add a bay
      </Button>
      <Problem error={error} />
    </section>
  );
}
