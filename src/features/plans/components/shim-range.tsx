import { TextField } from '../../../components/ui/field';
import { mm, num } from '../form-values';
import { shimSizeCount } from '../engine-words';

interface Props {
  min: string;
  max: string;
  step: string;
  onChange: (k: 'shimMinMm' | 'shimMaxMm' | 'shimStepMm', v: string) => void;
  error: (path: string) => string | undefined;
}

/** The shim series the workshop stocks, with the number of sizes it holds counted as it is typed. */
export function ShimRange({ min, max, step, onChange, error }: Props) {
  const [lo, hi, st] = [num(min), num(max), num(step)];
  const count = shimSizeCount(lo, hi, st);
  return (
    <fieldset className="grid gap-4 rounded-card border-2 border-ink-line p-4 sm:grid-cols-3">
      <legend className="px-1 font-semibold">Shim series</legend>
      <TextField label="Thinnest shim" inputMode="decimal" suffix="mm" value={min} onChange={(e) => onChange('shimMinMm', e.target.value)} error={error('shimMinMm')} placeholder="e.g. 1.20" />
      <TextField label="Thickest shim" inputMode="decimal" suffix="mm" value={max} onChange={(e) => onChange('shimMaxMm', e.target.value)} error={error('shimMaxMm')} placeholder="e.g. 2.40" />
      <TextField label="Step" inputMode="decimal" suffix="mm" value={step} onChange={(e) => onChange('shimStepMm', e.target.value)} error={error('shimStepMm')} placeholder="e.g. 0.05" />
      <p aria-live="polite" className="num sm:col-span-3">
        {count ? (
          <>
            <strong>{count} sizes</strong>: {count > 2 ? `${mm(lo)}, ${mm((lo ?? 0) + (st ?? 0))} … ${mm(hi)}` : `${mm(lo)}, ${mm(hi)}`} mm
          </>
        ) : lo != null && hi != null && st != null ? (
          <span className="text-ink-soft">These do not make a whole number of sizes yet: the range must go in whole steps.</span>
        ) : (
          <span className="text-ink-soft">Give the range and step, e.g. 1.20 to 2.40 mm by 0.05 mm (25 sizes).</span>
        )}
      </p>
    </fieldset>
  );
}
