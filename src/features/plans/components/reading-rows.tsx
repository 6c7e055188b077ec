import { Button } from '../../../components/ui/button';
import { CheckField } from '../../../components/ui/check-field';
import { SelectField, TextField } from '../../../components/ui/field';
import { describeLimit } from '../../../../shared/domain/limits';
import { num } from '../form-values';
import { rowKey, type ReadingRow } from '../item-values';
import { TreadDefault, type TreadSetting } from './tread-default';

const KIND_LABELS: Record<ReadingRow['kind'], string> = { measure: 'Measurement', check: 'Done or not', date: 'Date' };

function consequence(r: ReadingRow) {
  if (r.kind === 'date') return 'The technician records a date.';
  if (r.kind === 'check') return r.safetyCritical ? 'Marked “not done”, it takes the bike out of service.' : 'The technician marks it done or not done.';
  const limit = describeLimit({ min: num(r.min), max: num(r.max) }, r.unit.trim() || null);
  if (limit === 'no limit') return 'Recorded without a limit.';
  return r.safetyCritical ? `Limit ${limit}: a value outside takes the bike out of service at once.` : `Limit ${limit}: a value outside is flagged; the bike stays in service.`;
}

interface Props {
  rows: ReadingRow[];
  onChange: (rows: ReadingRow[]) => void;
  error: (path: string) => string | undefined;
  tread: TreadSetting | undefined;
}

/** What the technician must record when signing the work off, each with its limits. */
export function ReadingRows({ rows, onChange, error, tread }: Props) {
  const edit = (i: number, patch: Partial<ReadingRow>) => onChange(rows.map((r, j) => (j === i ? { ...r, ...patch } : r)));
  // A tread reading starts from the site-wide minimum; only blanks are filled, nothing typed is overwritten.
  const relabel = (i: number, label: string) => {
    const r = rows[i];
    const fill = tread && r.kind === 'measure' && /tread/i.test(label) && !r.min.trim() && !r.unit.trim();
    edit(i, fill ? { label, unit: 'mm', min: String(tread.minMm), safetyCritical: true } : { label });
  };
  const add = (r: Partial<ReadingRow>) => onChange([...rows, { key: rowKey(), label: '', kind: 'measure', unit: '', min: '', max: '', safetyCritical: false, ...r }]);
  return (
    <fieldset className="flex flex-col gap-3">
      <legend className="mb-1 text-lg font-semibold">Readings to record at sign-off</legend>
      {rows.length === 0 && <p className="text-ink-soft">None: the technician only signs the work off.</p>}
      {rows.map((r, i) => (
        <div key={r.key} className="grid gap-3 rounded-card border-2 border-ink-line bg-paper p-3 md:grid-cols-12">
          <TextField label="Reading" value={r.label} onChange={(e) => relabel(i, e.target.value)} error={error(`readings.${i}.label`)} placeholder="e.g. Rear tyre tread" className="md:col-span-4" />
          <SelectField label="Kind" value={r.kind} onChange={(e) => edit(i, { kind: e.target.value as ReadingRow['kind'] })} className="md:col-span-2">
            {(Object.keys(KIND_LABELS) as ReadingRow['kind'][]).map((k) => <option key={k} value={k}>{KIND_LABELS[k]}</option>)}
          </SelectField>
          {r.kind === 'measure' && (
            <>
              <TextField label="Unit" value={r.unit} onChange={(e) => edit(i, { unit: e.target.value })} error={error(`readings.${i}.unit`)} placeholder="e.g. mm" className="md:col-span-2" />
              <TextField label="At least" inputMode="decimal" value={r.min} onChange={(e) => edit(i, { min: e.target.value })} error={error(`readings.${i}.min`)} suffix={r.unit || undefined} className="md:col-span-2" />
              <TextField label="At most" inputMode="decimal" value={r.max} onChange={(e) => edit(i, { max: e.target.value })} error={error(`readings.${i}.max`)} suffix={r.unit || undefined} className="md:col-span-2" />
            </>
          )}
          <CheckField label="Safety-critical" checked={r.safetyCritical} onChange={(e) => edit(i, { safetyCritical: e.target.checked })} className="md:col-span-4" />
          <p className="text-sm text-ink-soft md:col-span-6 md:self-center">{consequence(r)}</p>
          <Button kind="quiet" className="md:col-span-2 md:justify-self-end" onClick={() => onChange(rows.filter((_, j) => j !== i))} aria-label={`Remove reading ${r.label || i + 1}`}>
            Remove
          </Button>
          {/tread/i.test(r.label) && tread && <TreadDefault tread={tread} className="md:col-span-12" />}
        </div>
      ))}
      <div className="flex flex-wrap gap-2">
        <Button kind="secondary" onClick={() => add({})}>Add a measurement</Button>
        <Button kind="secondary" onClick={() => add({ kind: 'check' })}>Add a check</Button>
        <Button kind="secondary" onClick={() => add({ kind: 'date' })}>Add a date</Button>
        {tread && (
          <Button kind="secondary" onClick={() => add({ label: 'Tyre tread', unit: 'mm', min: String(tread.minMm), safetyCritical: true })}>
            Add tyre tread (at least {tread.minMm} mm)
          </Button>
        )}
      </div>
    </fieldset>
  );
}
