import { SelectField } from '../../../components/ui/field';
import { Segmented } from '../../../components/ui/segmented';
import type { Blade } from '../../../../shared/domain/feeler';
import { pickSlides, type EntryReading, type ValveEntry } from '../card-state';
import { clearanceText, fmtMm, type ClearanceUnit } from '../clearance-format';
import { ClearanceField } from './clearance-field';

interface Props {
  label: string;
  entry: ValveEntry;
  reading: EntryReading;
  series: Blade[];
  unit: ClearanceUnit;
  onChange: (e: ValveEntry) => void;
  disabled?: boolean;
}

/**
 * Blades as stamped (the reading below shows both units). A blade picked with another gauge
 * set stays selectable, so switching sets never loses a reading.
 */
function bladeOptions(series: Blade[], current: string) {
  const known = series.some((b) => String(b.mm) === current);
  return (
    <>
      {series.map((b) => (
        <option key={b.mm} value={String(b.mm)}>{b.label}</option>
      ))}
      {current && current !== 'none' && !known && <option value={current}>{fmtMm(Number(current))} mm (other gauge set)</option>}
    </>
  );
}

export function AsFoundEntry({ label, entry, reading, series, unit, onChange, disabled }: Props) {
  return (
    <div className="flex flex-col gap-3">
      <Segmented
        legend={`${label}: how the as-found clearance was measured`}
        quietLegend
        disabled={disabled}
        value={entry.method}
        options={[{ value: 'feeler', label: 'Feeler blades' }, { value: 'direct', label: 'Measured value' }]}
        onChange={(method) => onChange({ ...entry, method })}
      />
      {entry.method === 'feeler' ? (
        <div className="grid gap-3 sm:grid-cols-2">
          <SelectField
            label="Slides in with a light drag"
            value={entry.slides}
            disabled={disabled}
            onChange={(e) => onChange(pickSlides(entry, e.target.value, series))}
            hint="The thickest blade that goes in, held flat."
            className="num text-reading [&_label]:text-lg"
          >
            <option value="">Choose a blade</option>
            <option value="none">None enters (tighter than the thinnest)</option>
            {bladeOptions(series, entry.slides)}
          </SelectField>
          <SelectField
            label="Next blade, will not enter"
            value={entry.stops}
            disabled={disabled}
            onChange={(e) => onChange({ ...entry, stops: e.target.value, stopsByHand: true })}
            hint={entry.stopsByHand ? 'Picked by hand.' : 'Suggested: the next blade up. Change it if you tried another.'}
            className="num text-reading [&_label]:text-lg"
          >
            <option value="">Not tried</option>
            {bladeOptions(series, entry.stops)}
          </SelectField>
        </div>
      ) : (
        <ClearanceField
          label="As found, measured"
          text={entry.directText}
          unit={entry.directUnit}
          cardUnit={unit}
          disabled={disabled}
          error={reading.asFoundError}
          onChange={(directText, directUnit) => onChange({ ...entry, directText, directUnit })}
        />
      )}
      {reading.asFoundError && entry.method === 'feeler' && (
        <p role="alert" className="font-medium text-state-stop">⚠ {reading.asFoundError}</p>
      )}
      {reading.asFoundMm != null && (
        <p className="num text-reading">
          As found <strong>{clearanceText(reading.asFoundMm, unit)}</strong>
          {reading.asFoundBelowMm != null && <span className="block text-base text-ink-soft">The gap is at least this and under {clearanceText(reading.asFoundBelowMm, unit)}.</span>}
        </p>
      )}
    </div>
  );
}
