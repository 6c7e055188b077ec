import { useId, type InputHTMLAttributes, type ReactNode, type SelectHTMLAttributes } from 'react';

interface FieldProps {
  label: string;
  error?: string;
  hint?: ReactNode;
  suffix?: string;
}

const control =
  'min-h-tap w-full rounded-card border-2 border-ink-line bg-paper-raised px-3 text-ink placeholder:text-ink-muted focus:border-accent aria-[invalid=true]:border-state-stop';

export function TextField({ label, error, hint, suffix, className = '', ...rest }: FieldProps & InputHTMLAttributes<HTMLInputElement>) {
  const id = useId();
  return (
    <div className={className}>
      <label htmlFor={id} className="mb-1 block font-semibold">
        {label}
      </label>
      <div className="flex items-center gap-2">
        <input id={id} aria-invalid={!!error} aria-describedby={`${id}-msg`} className={control} {...rest} />
        {suffix && <span className="text-ink-soft">{suffix}</span>}
      </div>
      <FieldMessage id={`${id}-msg`} error={error} hint={hint} />
    </div>
  );
}

export function SelectField({ label, error, hint, children, className = '', ...rest }: FieldProps & SelectHTMLAttributes<HTMLSelectElement>) {
  const id = useId();
  return (
    <div className={className}>
      <label htmlFor={id} className="mb-1 block font-semibold">
        {label}
      </label>
      <select id={id} aria-invalid={!!error} aria-describedby={`${id}-msg`} className={control} {...rest}>
        {children}
      </select>
      <FieldMessage id={`${id}-msg`} error={error} hint={hint} />
    </div>
  );
}

function FieldMessage({ id, error, hint }: { id: string; error?: string; hint?: ReactNode }) {
  if (error)
    return (
      <p id={id} role="alert" className="mt-1 text-sm font-medium text-state-stop">
        ⚠ {error}
      </p>
    );
  return hint ? (
    <p id={id} className="mt-1 text-sm text-ink-muted">
      {hint}
    </p>
  ) : null;
}
