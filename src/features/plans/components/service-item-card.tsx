import { useState } from 'react';
import { Button } from '../../../components/ui/button';
import { ToneBadge } from '../../../components/ui/tone-badge';
import { formatMinutes } from '../../../lib/format';
import { describeLimit } from '../../../../shared/domain/limits';
import { CATEGORY_LABELS } from '../../../../shared/schemas/plans';
import { useDeleteItem } from '../api';
import { RecomputeNote } from './recompute-note';
import type { PlanItem } from '../schemas';

const nf = new Intl.NumberFormat('en-GB');

/** The interval as a maintenance chart words it. */
export function intervalWords(i: PlanItem) {
  const parts = [i.everyKm != null && `${nf.format(i.everyKm)} km`, i.everyMonths != null && `${i.everyMonths} ${i.everyMonths === 1 ? 'month' : 'months'}`].filter(Boolean);
  const out: string[] = [];
  if (parts.length) out.push(`Every ${parts.join(' or ')}${parts.length > 1 ? ', whichever comes first' : ''}`);
  if (i.ruleText) out.push(`on the calendar: ${i.ruleText}`);
  if (i.firstAtKm != null) out.push(`first at ${nf.format(i.firstAtKm)} km`);
  const words = out.join('; ');
  return words ? words[0].toUpperCase() + words.slice(1) : 'No interval';
}

interface Props {
  modelId: string;
  item: PlanItem;
  bikes: number;
  canEdit: boolean;
  onEdit: () => void;
  onRemoved: (bikesRecomputed: number) => void;
}

export function ServiceItemCard({ modelId, item, bikes, canEdit, onEdit, onRemoved }: Props) {
  const remove = useDeleteItem(modelId, item.id);
  const [confirming, setConfirming] = useState(false);
  return (
    <article aria-label={item.name} className="flex flex-col gap-2 rounded-card border-2 border-ink-line bg-paper-raised p-4">
      <header className="flex flex-wrap items-center gap-2">
        <h3 className="text-lg font-bold">{item.name}</h3>
        <span className="text-ink-soft">· {CATEGORY_LABELS[item.category]}</span>
        {item.safetyCritical && <ToneBadge tone="stop" icon="!">Safety-critical</ToneBadge>}
      </header>
      <p className="num">{intervalWords(item)} · takes about {formatMinutes(item.estimatedMinutes)}</p>
      {item.readings.length > 0 && (
        <ul className="num flex flex-wrap gap-x-4 gap-y-1 text-sm text-ink-soft">
          {item.readings.map((r) => (
            <li key={r.id}>
              {r.safetyCritical && <span aria-hidden className="font-black text-state-stop">! </span>}
              {r.label}
              {r.kind === 'measure' ? ` (${describeLimit(r, r.unit)})` : r.kind === 'check' ? ' (done or not)' : ' (date)'}
              {r.safetyCritical && <span className="sr-only"> safety-critical</span>}
            </li>
          ))}
        </ul>
      )}
      {canEdit && (
        <div className="flex flex-wrap items-center gap-2">
          <Button kind="secondary" onClick={onEdit}>Edit</Button>
          {!confirming ? (
            <Button kind="quiet" onClick={() => setConfirming(true)}>Remove…</Button>
          ) : (
            <>
              <span className="font-semibold">Remove {item.name} from the plan?</span>
              <Button kind="danger" disabled={remove.isPending} onClick={() => remove.mutate(undefined, { onSuccess: (d) => onRemoved(d.bikesRecomputed) })}>Yes, remove</Button>
              <Button kind="secondary" onClick={() => { setConfirming(false); remove.reset(); }}>Keep it</Button>
            </>
          )}
        </div>
      )}
      {confirming && <RecomputeNote bikes={bikes} verb="Removing it" />}
      {remove.error && <p role="alert" className="text-state-stop">⚠ {remove.error.message}</p>}
    </article>
  );
}
