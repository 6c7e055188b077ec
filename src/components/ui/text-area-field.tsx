import { useId, type TextareaHTMLAttributes } from 'react';

export function TextAreaField({ label, error, hint, className = '', ...rest }: { label: string; error?: string; hint?: string } & TextareaHTMLAttributes<HTMLTextAreaElement>) {
  const id = useId();
  return (
    <div className={className}>
      <label htmlFor={id} className="mb-1 block font-semibold">{label}</label>
      <textarea
        id={id}
        rows={3}
        aria-invalid={!!error}
        aria-describedby={`${id}-msg`}
        className="w-full rounded-card border-2 border-ink-line bg-paper-raised px-3 py-2 text-ink placeholder:text-ink-muted focus:border-accent aria-[invalid=true]:border-state-stop"
        {...rest}
      />
      {error ? (
        <p id={`${id}-msg`} role="alert" className="mt-1 text-sm font-medium text-state-stop">⚠ {error}</p>
      ) : hint ? (
        <p id={`${id}-msg`} className="mt-1 text-sm text-ink-muted">{hint}</p>
      ) : null}
    </div>
  );
}
