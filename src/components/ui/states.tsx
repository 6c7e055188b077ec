import type { ReactNode } from 'react';
import { Button } from './button';

export function Loading({ what }: { what: string }) {
  return (
    <div role="status" className="flex items-center gap-3 rounded-card bg-paper-raised p-6 text-ink-soft">
      <span className="h-4 w-4 animate-spin rounded-full border-2 border-ink-line border-t-accent" aria-hidden />
      Loading {what}…
    </div>
  );
}

export function Empty({ title, children }: { title: string; children?: ReactNode }) {
  return (
    <div className="rounded-card border-2 border-dashed border-ink-line p-8 text-center">
      <p className="text-lg font-semibold">{title}</p>
      {children && <div className="mt-2 text-ink-soft">{children}</div>}
    </div>
  );
}

export function ErrorPanel({ error, retry }: { error: Error; retry?: () => void }) {
  return (
    <div role="alert" className="rounded-card border-2 border-state-stop bg-state-stop-soft p-6">
      <p className="font-semibold text-state-stop">Could not load this.</p>
      <p className="mt-1">{error.message}</p>
      {retry && (
        <Button kind="secondary" className="mt-3" onClick={retry}>
          Try again
        </Button>
      )}
    </div>
  );
}

export function PageHeader({ title, children }: { title: string; children?: ReactNode }) {
  return (
    <div className="mb-5 flex flex-wrap items-end justify-between gap-3">
      <h1 className="text-display font-bold">{title}</h1>
      {children && <div className="flex flex-wrap gap-2">{children}</div>}
    </div>
  );
}

/** The one line, always in the same place, that says who decides on safety. */
export function SafetyNote({ children }: { children?: ReactNode }) {
  return (
    <p className="mt-6 border-l-4 border-ink-soft bg-paper-sunk px-4 py-2 text-sm text-ink-soft">
      {children ?? 'Lashline tracks and reminds. The maker’s service manual and a qualified technician decide, under local law.'}
    </p>
  );
}
