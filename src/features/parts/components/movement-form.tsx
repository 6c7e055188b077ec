import { useState, type FormEvent } from 'react';
import { Button } from '../../../components/ui/button';
import { SelectField, TextField } from '../../../components/ui/field';
import { Segmented } from '../../../components/ui/segmented';
import { toast } from '../../../components/ui/toast';
import { ApiError } from '../../../lib/api-client';
import { PART_UNITS, UNIT_WORDS, formatQty, type MovementKind, type PartUnit } from '../../../../shared/domain/parts';
import { StockMovementCreateSchema, type StockLine } from '../../../../shared/schemas/parts';
import type { Site } from '../../../../shared/schemas/reference';
import { useBookMovement } from '../api';
import { MOVEMENT_WORDS } from '../parts-words';

type FormKind = Exclude<MovementKind, 'transfer-in'>;
const KINDS: { value: FormKind; label: string }[] = [
  { value: 'received', label: MOVEMENT_WORDS.received },
  { value: 'used', label: MOVEMENT_WORDS.used },
  { value: 'stock-take', label: MOVEMENT_WORDS['stock-take'] },
  { value: 'transfer-out', label: 'To another site' },
  { value: 'write-off', label: 'Write off' },
];

interface Props {
  siteId: string;
  items: StockLine[];
  /** The user's other sites, where a transfer can go. */
  otherSites: Site[];
  partId: string;
  onPart: (partId: string) => void;
}

/** Every change to the shelf is a movement with a kind, so on hand is always the sum of the ledger. */
export function MovementForm({ siteId, items, otherSites, partId, onPart }: Props) {
  const part = items.find((p) => p.partId === partId);
  const [kind, setKind] = useState<FormKind>('received');
  const [quantity, setQuantity] = useState('');
  // A unit chosen by hand holds for the part it was chosen for; another part starts from its own unit.
  const [unitFor, setUnitFor] = useState<{ partId: string; unit: PartUnit } | null>(null);
  const [otherSiteId, setOtherSiteId] = useState('');
  const [note, setNote] = useState('');
  const [errors, setErrors] = useState<Record<string, string>>({});
  const book = useBookMovement();
  const shownUnit = unitFor?.partId === partId ? unitFor.unit : (part?.unit ?? 'each');

  const submit = (e: FormEvent) => {
    e.preventDefault();
    book.reset();
    if (!part) return setErrors({ partId: 'Choose the part that moved.' });
    const parsed = StockMovementCreateSchema.safeParse({
      siteId, partId, kind, unit: shownUnit,
      quantity: quantity.trim() === '' ? Number.NaN : Number(quantity),
      note: note.trim() || undefined,
      otherSiteId: kind === 'transfer-out' ? otherSiteId || undefined : undefined,
    });
    if (!parsed.success) return setErrors(Object.fromEntries(parsed.error.issues.map((i) => [i.path.join('.'), i.message])));
    setErrors({});
    book.mutate(parsed.data, {
      onSuccess: () => {
        const what = `${formatQty(parsed.data.quantity, parsed.data.unit)} of ${part.name}`;
        toast(kind === 'stock-take' ? `Counted ${what} on the shelf.` : `${MOVEMENT_WORDS[kind]}: ${what}.`);
        setQuantity('');
        setNote('');
      },
    });
  };
  // A refusal says what to do in a sentence or two: it gets the form's full width rather than a narrow field's.
  const err = book.error instanceof ApiError ? book.error : null;
  const refusal = err?.details.length === 1 ? err.details[0].message : book.error?.message;

  return (
    <form id="movement" onSubmit={submit} noValidate aria-labelledby="movement-title" className="flex flex-col gap-4 rounded-card border-2 border-accent bg-paper-raised p-4">
      <h2 id="movement-title" className="text-xl font-bold">Book a movement or a stock-take</h2>
      <SelectField label="Part" value={partId} onChange={(e) => onPart(e.target.value)} error={errors.partId} className="text-lg">
        <option value="" disabled>Choose a part</option>
        {items.map((p) => <option key={p.partId} value={p.partId}>{p.partNumber} · {p.name}</option>)}
      </SelectField>
      <Segmented legend="What happened" value={kind} onChange={setKind} options={otherSites.length ? KINDS : KINDS.filter((k) => k.value !== 'transfer-out')} />
      <div className="flex flex-wrap items-end gap-4">
        <TextField
          label={kind === 'stock-take' ? 'Count on the shelf' : 'Quantity'}
          type="number" inputMode="decimal" min={0} step="any" value={quantity} onChange={(e) => setQuantity(e.target.value)}
          error={errors.quantity}
          hint={part && `On hand now: ${formatQty(part.onHand, part.unit)}`}
          className="num w-44 text-lg"
        />
        <SelectField label="Unit" value={shownUnit} onChange={(e) => setUnitFor({ partId, unit: e.target.value as PartUnit })} error={errors.unit} className="w-36 text-lg">
          {PART_UNITS.map((u) => <option key={u} value={u}>{UNIT_WORDS[u].many}</option>)}
        </SelectField>
        {kind === 'transfer-out' && (
          <SelectField label="To site" value={otherSiteId} onChange={(e) => setOtherSiteId(e.target.value)} error={errors.otherSiteId} className="w-56 text-lg">
            <option value="">Choose the site</option>
            {otherSites.map((s) => <option key={s.id} value={s.id}>{s.name}</option>)}
          </SelectField>
        )}
      </div>
      {kind === 'stock-take' && <p className="text-ink-soft">Type what you counted; the difference from on hand is booked.</p>}
      <TextField label="Note" value={note} onChange={(e) => setNote(e.target.value)} error={errors.note} hint="e.g. the delivery note, the bike, why it was thrown away." className="text-lg" />
      {refusal && <p role="alert" className="rounded-card border-2 border-state-stop bg-state-stop-soft p-3 text-state-stop">⚠ Not booked. {refusal}</p>}
      <Button type="submit" className="min-h-14 self-start px-8 text-lg" disabled={book.isPending}>{book.isPending ? 'Saving…' : 'Book it'}</Button>
    </form>
  );
}
