import type { InputHTMLAttributes, ReactNode } from 'react';

/** A checkbox with a target big enough for a gloved finger: the whole row is the label. */
export function CheckField({ label, hint, className = '', ...rest }: { label: ReactNode; hint?: ReactNode } & Omit<InputHTMLAttributes<HTMLInputElement>, 'type'>) {
  return (
    <label className={`flex min-h-tap cursor-pointer items-center gap-3 rounded-card border-2 border-ink-line bg-paper-raised px-3 py-2 ${className}`}>
      <input type="checkbox" className="h-6 w-6 shrink-0 accent-accent" {...rest} />
      <span>
        <span className="font-semibold">{label}</span>
        {hint && <span className="block text-sm text-ink-muted">{hint}</span>}
      </span>
    </label>
  );
}
