import { useId } from 'react';
import { SelectField } from '../../../components/ui/field';
import { DEFECT_CATEGORIES, DEFECT_LABELS } from '../../../../shared/schemas/due';

export interface DefectDraft {
  category: string;
  text: string;
  safetyCritical: boolean;
}

interface Props {
  value: DefectDraft;
  onChange: (v: DefectDraft) => void;
  errors: { category?: string; text?: string };
}

export function DefectFields({ value, onChange, errors }: Props) {
  const id = useId();
  return (
    <fieldset className="grid gap-4 rounded-card border-2 border-ink-line bg-paper p-4">
      <legend className="px-1 text-lg font-semibold">Defect</legend>
      <SelectField label="What does it concern?" value={value.category} onChange={(e) => onChange({ ...value, category: e.target.value })} error={errors.category} className="max-w-sm">
        <option value="">Choose one</option>
        {DEFECT_CATEGORIES.map((c) => (
          <option key={c} value={c}>{DEFECT_LABELS[c]}</option>
        ))}
      </SelectField>
      <div>
        <label htmlFor={id} className="mb-1 block font-semibold">What is wrong?</label>
        <textarea
          id={id}
          rows={3}
          value={value.text}
          onChange={(e) => onChange({ ...value, text: e.target.value })}
          aria-invalid={!!errors.text}
          placeholder="e.g. front brake lever feels soft"
          className="w-full rounded-card border-2 border-ink-line bg-paper-raised px-3 py-2 text-lg focus:border-accent aria-[invalid=true]:border-state-stop"
        />
        {errors.text && <p role="alert" className="mt-1 text-sm font-medium text-state-stop">⚠ {errors.text}</p>}
      </div>
      <label className="flex min-h-tap cursor-pointer items-start gap-3 rounded-card border-2 border-state-stop bg-state-stop-soft p-3">
        <input
          type="checkbox"
          checked={value.safetyCritical}
          onChange={(e) => onChange({ ...value, safetyCritical: e.target.checked })}
          className="mt-0.5 h-7 w-7 shrink-0 accent-state-stop"
        />
        <span className="text-lg">
          <span className="font-bold">Safety-critical: take the bike out of service.</span>{' '}
          The bike is grounded and the manager is told. A technician returns it to service.
        </span>
      </label>
    </fieldset>
  );
}
