import { formatQty, UNIT_WORDS } from '../../../shared/domain/parts';
import type { TaskPart } from '../../../shared/schemas/parts';

interface Props {
  taskId: string;
  parts: TaskPart[];
  /** What is typed, by part: the suggestion until someone changes it. */
  values: Record<string, string>;
  onChange: (partId: string, raw: string) => void;
  error?: (path: string) => string | undefined;
}

/** The raw figure for a part: what was typed, else the card's suggestion. */
export const usedRaw = (p: TaskPart, values: Record<string, string>) => values[p.partId] ?? String(p.suggested);

/** Parts the service took from the shelf: pre-filled with what every such service uses, each editable ("used 1.1 L"). */
export function PartsUsed({ taskId, parts, values, onChange, error }: Props) {
  if (!parts.length) return null;
  const whole = error?.('parts');
  return (
    <fieldset className="flex flex-col gap-2">
      <legend className="mb-1 text-lg font-bold">Parts used ({parts.length})</legend>
      <p className="text-sm text-ink-soft">Booked off this site’s shelf when you sign off. Type 0 for a part you did not use.</p>
      {parts.map((p) => {
        const id = `used-${taskId}-${p.partId}`;
        const err = error?.(`parts.${p.partId}`);
        return (
          <div key={p.partId} className="flex flex-wrap items-center gap-x-3 gap-y-1">
            <label htmlFor={id} className="min-w-56 flex-1 font-semibold">
              {p.name} <span className="num font-normal text-ink-soft">{p.partNumber}</span>
            </label>
            <input
              id={id}
              inputMode="decimal"
              value={usedRaw(p, values)}
              onChange={(e) => onChange(p.partId, e.target.value)}
              aria-invalid={!!err || undefined}
              aria-describedby={`${id}-hint`}
              className="num w-24 rounded-card border-2 border-ink-line bg-paper-raised px-3 py-2 text-lg focus:border-accent"
            />
            <span>{UNIT_WORDS[p.unit].many}</span>
            <span id={`${id}-hint`} className="num text-sm text-ink-soft">
              usually {formatQty(p.usual, p.unit)}{p.share < 1 ? ` at ${Math.round(p.share * 100)} % of services` : ''} · {formatQty(p.onHand, p.unit)} on the shelf
            </span>
            {err && <p role="alert" className="w-full text-sm text-state-stop">⚠ {err}</p>}
          </div>
        );
      })}
      {whole && <p role="alert" className="font-semibold text-state-stop">⚠ {whole}</p>}
    </fieldset>
  );
}

/** The figures to send, or the parts whose figure is not a number. */
export function partsToSend(parts: TaskPart[], values: Record<string, string>) {
  const bad: string[] = [];
  const lines = parts.map((p) => {
    const raw = usedRaw(p, values).trim().replace(',', '.');
    const quantity = raw === '' ? 0 : Number(raw);
    if (!Number.isFinite(quantity) || quantity < 0) bad.push(p.partId);
    return { partId: p.partId, quantity, unit: p.unit };
  });
  return { lines, bad };
}
