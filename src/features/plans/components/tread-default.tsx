export interface TreadSetting {
  minMm: number;
  source: string;
}

/** Where a tread minimum comes from: the site-wide setting, a default that local law overrides. */
export function TreadDefault({ tread, className = '' }: { tread: TreadSetting; className?: string }) {
  return (
    <details className={`text-sm text-ink-soft ${className}`}>
      <summary className="min-h-tap cursor-pointer content-center">
        Tread minimum in Settings: <span className="num font-semibold text-ink">{tread.minMm} mm</span>. Local law decides.
      </summary>
      <p className="mt-1 border-l-4 border-ink-line pl-3">{tread.source}</p>
    </details>
  );
}
