import type { z } from 'zod';
import type { RideVerdictSchema } from '../../../shared/schemas/bikes';

type Verdict = z.infer<typeof RideVerdictSchema>;

/**
 * Whether the bike may be handed to a rider, in words, a shape and a colour.
 * A refusal is a fixed panel, never a dismissable warning.
 */
export function RideVerdictPanel({ ride, large = false }: { ride: Verdict; large?: boolean }) {
  const go = ride.mayRide;
  return (
    <section
      role={go ? 'status' : 'alert'}
      aria-label="May this bike go out?"
      className={`rounded-card border-4 ${large ? 'p-6' : 'p-4'} ${go ? 'border-state-ok bg-state-ok-soft text-ink' : 'border-state-stop bg-state-stop text-white'}`}
    >
      <p className={`flex items-center gap-3 font-bold ${large ? 'text-display' : 'text-reading'}`}>
        <span aria-hidden className={`inline-flex shrink-0 items-center justify-center rounded-full font-black ${large ? 'h-14 w-14 text-3xl' : 'h-9 w-9 text-xl'} ${go ? 'bg-state-ok text-white' : 'bg-white text-state-stop'}`}>
          {go ? '✓' : '■'}
        </span>
        {go ? 'May go out' : 'Do not hand this bike to a rider'}
      </p>
      {go ? (
        <p className={`mt-2 ${large ? 'text-lg' : ''}`}>Not grounded and no safety-critical work overdue.</p>
      ) : (
        <ul className={`mt-3 list-disc space-y-1 pl-6 ${large ? 'text-lg' : ''}`}>
          {ride.reasons.map((r) => (
            <li key={r}>{r}</li>
          ))}
        </ul>
      )}
    </section>
  );
}
