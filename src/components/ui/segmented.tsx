import { useId, type ReactNode } from 'react';

interface Option<T extends string> {
  value: T;
  label: ReactNode;
}

interface Props<T extends string> {
  legend: string;
  value: T;
  options: readonly Option<T>[];
  onChange: (value: T) => void;
  /** Hide the legend visually (it stays for screen readers) when a heading already says it. */
  quietLegend?: boolean;
  disabled?: boolean;
}

/** One choice out of a few, as a row of big buttons: radio inputs underneath, so arrows and Tab work. */
export function Segmented<T extends string>({ legend, value, options, onChange, quietLegend, disabled }: Props<T>) {
  const name = useId();
  return (
    <fieldset disabled={disabled}>
      <legend className={quietLegend ? 'sr-only' : 'mb-1 font-semibold'}>{legend}</legend>
      <div className="inline-flex flex-wrap overflow-hidden rounded-card border-2 border-ink-line bg-paper-raised">
        {options.map((o) => (
          <label key={o.value} className="relative">
            <input
              type="radio"
              name={name}
              value={o.value}
              checked={value === o.value}
              onChange={() => onChange(o.value)}
              className="peer sr-only"
            />
            <span className="flex min-h-tap min-w-tap cursor-pointer items-center justify-center px-4 font-semibold peer-checked:bg-ink peer-checked:text-paper peer-focus-visible:outline-3 peer-focus-visible:outline-accent peer-disabled:cursor-not-allowed peer-disabled:opacity-60">
              {value === o.value && <span aria-hidden className="mr-1.5">✓</span>}
              {o.label}
            </span>
          </label>
        ))}
      </div>
    </fieldset>
  );
}
