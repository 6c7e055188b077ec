import type { ReactNode } from 'react';

const TONE = { stop: 'bg-state-stop text-white', soon: 'bg-state-soon text-ink', ink: 'bg-ink text-white' } as const;

export function WeekSection({ title, icon, count, tone, children }: { title: string; icon: string; count: number; tone: keyof typeof TONE; children: ReactNode }) {
  const id = `week-${title.toLowerCase().replace(/\W+/g, '-')}`;
  return (
    <section aria-labelledby={id} className="flex flex-col gap-2">
      <h2 id={id} className="flex items-center gap-2 text-xl font-bold">
        <span aria-hidden className={`inline-flex h-7 w-7 items-center justify-center rounded-full text-sm font-black ${count ? TONE[tone] : 'bg-paper-sunk text-ink-muted'}`}>
          {icon}
        </span>
        {title}
        <span className="num font-normal text-ink-soft">({count})</span>
      </h2>
      {children}
    </section>
  );
}
