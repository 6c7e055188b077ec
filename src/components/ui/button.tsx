import type { ButtonHTMLAttributes } from 'react';

type Kind = 'primary' | 'secondary' | 'danger' | 'quiet';

const KIND: Record<Kind, string> = {
  primary: 'bg-accent text-white hover:bg-accent-strong disabled:bg-ink-muted',
  secondary: 'bg-paper-raised text-ink border-2 border-ink-line hover:border-ink-soft',
  danger: 'bg-state-stop text-white hover:opacity-90',
  quiet: 'text-accent underline-offset-4 hover:underline',
};

export function Button({ kind = 'primary', className = '', ...rest }: ButtonHTMLAttributes<HTMLButtonElement> & { kind?: Kind }) {
  return (
    <button
      type="button"
      className={`inline-flex min-h-tap min-w-tap items-center justify-center gap-2 rounded-card px-4 font-semibold transition-colors disabled:cursor-not-allowed ${KIND[kind]} ${className}`}
      {...rest}
    />
  );
}
