import type { ReadingTemplate } from '../../../../shared/schemas/tasks';
import { limitWords, readNumber } from './reading-judge';

/** Beside the button, in plain words: what signing off with these values does to the bike. Not dismissable. */
export function GroundingSummary({ fleetNumber, templates, values }: { fleetNumber: string; templates: ReadingTemplate[]; values: Record<string, string> }) {
  if (!templates.length) return null;
  return (
    <div aria-live="polite" className="rounded-card border-4 border-state-stop bg-state-stop p-4 text-white">
      <p className="flex items-center gap-3 text-reading font-bold">
        <span aria-hidden className="inline-flex h-9 w-9 shrink-0 items-center justify-center rounded-full bg-white text-xl font-black text-state-stop">■</span>
        Signing off takes {fleetNumber} out of service
      </p>
      <ul className="num mt-2 list-disc space-y-1 pl-6 text-xl">
        {templates.map((t) => (
          <li key={t.id}>
            {t.label}: {t.kind === 'check' ? 'not done' : `${readNumber(values[t.id] ?? '')} ${t.unit ?? ''}`.trim()} {t.kind === 'measure' && `(limit ${limitWords(t)})`}
          </li>
        ))}
      </ul>
      <p className="mt-2">It may not go out until the fault is put right and a manager or technician returns it to service.</p>
    </div>
  );
}
