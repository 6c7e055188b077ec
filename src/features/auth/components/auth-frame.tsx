import type { ReactNode } from 'react';
import { SafetyNote } from '../../../components/ui/states';

export function AuthFrame({ title, children }: { title: string; children: ReactNode }) {
  return (
    <main className="mx-auto flex min-h-screen max-w-md flex-col justify-center px-5 py-10">
      <p className="wordmark text-4xl text-ink">Lashline</p>
      <p className="mb-8 text-ink-soft">Service schedules, valve work and due lists for the fleet.</p>
      <div className="rounded-card border-2 border-ink-line bg-paper-raised p-6 shadow-sm">
        <h1 className="mb-4 text-2xl font-bold">{title}</h1>
        {children}
      </div>
      <SafetyNote />
    </main>
  );
}
