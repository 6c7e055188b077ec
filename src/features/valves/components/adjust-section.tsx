import { TextField } from '../../../components/ui/field';
import { CheckField } from '../../../components/ui/check-field';
import type { ValveSlotView } from '../../../../shared/schemas/valves';
import type { Adjuster, EntryReading, ValveEntry } from '../card-state';
import { fmtShim, shimMarkingText, type ClearanceUnit } from '../clearance-format';
import { ClearanceField } from './clearance-field';
import { ShimAdvice } from './shim-advice';
import type { PlannedShim } from '../engine-plan';

interface Props {
  slot: ValveSlotView;
  adjuster: Adjuster;
  entry: ValveEntry;
  reading: EntryReading;
  sizesMm: number[];
  unit: ClearanceUnit;
  onChange: (e: ValveEntry) => void;
  planned?: PlannedShim;
  disabled?: boolean;
}

const shimHint = (mm: number | null, fallback: string) => (mm == null ? fallback : `= ${fmtShim(mm)}`);

/** The shim (read off, advised, fitted) or the screw, then the clearance as left. */
export function AdjustSection({ slot, adjuster, entry, reading, sizesMm, unit, onChange, planned, disabled }: Props) {
  const set = (patch: Partial<ValveEntry>) => onChange({ ...entry, ...patch });
  return (
    <div className="flex flex-col gap-3">
      {adjuster === 'shim-under-bucket' ? (
        <>
          <TextField
            label="Shim marking read off"
            inputMode="decimal"
            autoComplete="off"
            value={entry.shimText}
            disabled={disabled}
            onChange={(e) => set({ shimText: e.target.value })}
            error={reading.shimError}
            hint={shimHint(reading.shimMm, 'As etched, e.g. 255 for 2.55 mm, or the micrometer reading in mm.') +
              (slot.currentShimMm != null ? ` · Last recorded: ${fmtShim(slot.currentShimMm)}` : '')}
            className="num text-reading [&_label]:text-lg"
          />
          <ShimAdvice slot={slot} reading={reading} sizesMm={sizesMm} unit={unit} planned={planned} disabled={disabled} onFit={(mm) => set({ fittedText: shimMarkingText(mm) })} />
          <TextField
            label="Shim fitted (empty if unchanged)"
            inputMode="decimal"
            autoComplete="off"
            value={entry.fittedText}
            disabled={disabled}
            onChange={(e) => set({ fittedText: e.target.value })}
            error={reading.fittedError}
            hint={shimHint(reading.fittedMm, 'The marking of the shim that went in.')}
            className="num text-reading [&_label]:text-lg"
          />
        </>
      ) : (
        <CheckField
          label="Adjusted the screw"
          hint="Turned the adjuster and locked the nut again."
          checked={entry.screwAdjusted}
          disabled={disabled}
          onChange={(e) => set({ screwAdjusted: e.target.checked })}
        />
      )}
      <ClearanceField
        label={reading.needsAsLeft ? 'As left, measured after adjusting (needed)' : 'As left, measured after adjusting'}
        text={entry.asLeftText}
        unit={entry.asLeftUnit}
        cardUnit={unit}
        disabled={disabled}
        onChange={(asLeftText, asLeftUnit) => set({ asLeftText, asLeftUnit })}
        error={reading.asLeftError}
        hint={reading.needsAsLeft ? undefined : 'Empty means left as found.'}
      />
    </div>
  );
}
