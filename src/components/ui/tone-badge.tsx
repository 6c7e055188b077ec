import type { ReactNode } from 'react';

export type Tone = 'ok' | 'soon' | 'stop' | 'neutral' | 'info';

const TONE: Record<Tone, string> = {
  ok: 'bg-state-ok-soft text-ink border-state-ok',
  soon: 'bg-state-soon text-ink border-state-soon',
  stop: 'bg-state-stop text-white border-state-stop',
  neutral: 'bg-paper-sunk text-ink-soft border-ink-line',
  info: 'bg-accent-soft text-ink border-accent',
};

/** A state in words and a shape as well as a colour, for states that have no badge of their own. */
export function ToneBadge({ tone, icon, children }: { tone: Tone; icon: string; children: ReactNode }) {
  return (
    <span className={`inline-flex items-center gap-1.5 whitespace-nowrap rounded-full border-2 px-2.5 py-0.5 text-sm font-semibold ${TONE[tone]}`}>
      <span aria-hidden className="font-black">{icon}</span>
      {children}
    </span>
  );
}
