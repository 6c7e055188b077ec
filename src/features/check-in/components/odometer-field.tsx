import { useId } from 'react';
import { formatDate, formatOdometer } from '../../../lib/format';
import type { BikeSummary } from '../../../../shared/schemas/bikes';

interface Props {
  bike: BikeSummary;
  value: string;
  onChange: (v: string) => void;
  error?: string;
}

/** The one number the desk types: large, with the unit printed beside it and the last reading to compare. */
export function OdometerField({ bike, value, onChange, error }: Props) {
  const id = useId();
  const unit = bike.odometerUnit;
  return (
    <div>
      <label htmlFor={id} className="mb-2 block text-reading font-semibold">
        Odometer now
      </label>
      <div className="flex items-center gap-3">
        <input
          id={id}
          inputMode="decimal"
          autoComplete="off"
          autoFocus
          value={value}
          onChange={(e) => onChange(e.target.value)}
          aria-invalid={!!error}
          aria-describedby={`${id}-msg ${id}-last`}
          className="num min-h-20 w-full max-w-xs rounded-card border-2 border-ink-line bg-paper-raised px-4 text-4xl font-bold focus:border-accent aria-[invalid=true]:border-state-stop"
        />
        <span className="text-display font-bold text-ink-soft">{unit === 'mi' ? 'mi' : 'km'}</span>
      </div>
      <p id={`${id}-last`} className="num mt-2 text-lg text-ink-soft">
        {bike.latestOdometer == null
          ? `No check-in yet. In service since ${formatDate(bike.inServiceDate)} at ${formatOdometer(bike.inServiceOdometer, unit)}.`
          : `Last reading ${formatOdometer(bike.latestOdometer, unit)} on ${formatDate(bike.latestReadingDate)}.`}
        {unit === 'mi' && ' This bike’s odometer reads miles.'}
      </p>
      {error && (
        <p id={`${id}-msg`} role="alert" className="mt-2 rounded-card border-2 border-state-stop bg-state-stop-soft p-3 text-lg font-medium text-state-stop">
          ⚠ {error}
        </p>
      )}
    </div>
  );
}

/** Readings as people type them: "12 345", "12,345" or "12345.6". */
export function parseReading(text: string): number | undefined {
  const t = text.trim().replace(/\s/g, '');
  if (!t) return undefined;
  const plain = /^\d{1,3}(,\d{3})+(\.\d+)?$/.test(t) ? t.replace(/,/g, '') : t.replace(',', '.');
  return /^\d+(\.\d+)?$/.test(plain) ? Number(plain) : Number.NaN;
}
