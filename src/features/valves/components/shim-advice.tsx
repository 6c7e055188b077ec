import { Button } from '../../../components/ui/button';
import { recommendShim, type ShimRecommendation } from '../../../../shared/domain/shims';
import type { ValveSlotView } from '../../../../shared/schemas/valves';
import type { EntryReading } from '../card-state';
import { clearanceText, fmtShim, type ClearanceUnit } from '../clearance-format';
import type { PlannedShim } from '../engine-plan';

interface Props {
  slot: ValveSlotView;
  reading: EntryReading;
  sizesMm: number[];
  unit: ClearanceUnit;
  planned?: PlannedShim;
  onFit: (mm: number) => void;
  disabled?: boolean;
}

function advise(slot: ValveSlotView, r: EntryReading, sizesMm: number[]): ShimRecommendation | string | null {
  if (r.asFoundMm == null || r.shimMm == null) return null;
  try {
    return recommendShim({ currentShimMm: r.shimMm, measuredClearanceMm: r.asFoundMm, specMinMm: slot.specMinMm, specMaxMm: slot.specMaxMm, sizesMm });
  } catch (e) {
    return (e as Error).message;
  }
}

/** The shim this valve wants, live as the readings are entered. */
export function ShimAdvice({ slot, reading, sizesMm, unit, planned, onFit, disabled }: Props) {
  const rec = advise(slot, reading, sizesMm);
  if (rec === null) return <p className="text-ink-soft">Enter the as-found clearance and the shim marking to see which shim fits.</p>;
  if (typeof rec === 'string') return <p role="alert" className="text-state-stop">⚠ {rec}</p>;
  if (rec.change === 'keep')
    return (
      <p className="num rounded-card border-2 border-state-ok bg-state-ok-soft p-3 text-lg">
        <span aria-hidden className="font-black">✓ </span>In spec: keep the {fmtShim(rec.shimMm!)} shim.
      </p>
    );
  if (rec.change === 'none-fits')
    return (
      <div className="num rounded-card border-2 border-state-stop bg-state-stop-soft p-3 text-lg">
        <p className="font-semibold"><span aria-hidden>■ </span>No size in the series brings this valve into spec.</p>
        <p>Order or have ground a {fmtShim(rec.exactShimMm)} shim (aims at {clearanceText(rec.targetMm, unit)}). A shim this far outside the series usually means the seat needs work: the service manual decides.</p>
      </div>
    );
  const other = planned && planned.installMm !== rec.shimMm ? planned : undefined;
  return (
    <div className="num flex flex-col gap-2 rounded-card border-2 border-accent bg-accent-soft p-3">
      <p className="text-reading">
        Fit <strong>{fmtShim(rec.shimMm!)}</strong> → expected {clearanceText(rec.expectedClearanceMm, unit)}
      </p>
      {other && (
        <p className="text-lg">
          The engine plan below fits <strong>{fmtShim(other.installMm)}</strong> ({other.from}) → expected {clearanceText(other.expectedMm, unit)}, so fewer shims are bought.
        </p>
      )}
      <div className="flex flex-wrap gap-2">
        {other && (
          <Button kind="secondary" className="min-h-14" disabled={disabled} onClick={() => onFit(other.installMm)}>
            I fitted {fmtShim(other.installMm)} (plan)
          </Button>
        )}
        <Button kind="secondary" className="min-h-14" disabled={disabled} onClick={() => onFit(rec.shimMm!)}>
          I fitted {fmtShim(rec.shimMm!)}
        </Button>
      </div>
    </div>
  );
}
