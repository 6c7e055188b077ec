import type { Blade } from '../../../../shared/domain/feeler';
import type { ValveSlotView } from '../../../../shared/schemas/valves';
import type { Adjuster, EntryReading, ValveEntry } from '../card-state';
import { clearanceText, specText, type ClearanceUnit } from '../clearance-format';
import { AsFoundEntry } from './as-found-entry';
import { AdjustSection } from './adjust-section';
import { SpecBadge } from './spec-badge';
import type { PlannedShim } from '../engine-plan';

interface Props {
  slot: ValveSlotView;
  adjuster: Adjuster;
  entry: ValveEntry;
  reading: EntryReading;
  series: Blade[];
  sizesMm: number[];
  unit: ClearanceUnit;
  onChange: (e: ValveEntry) => void;
  planned?: PlannedShim;
  /** Problems found on this valve by the last sign-off attempt, here or on the server. */
  problems: string[];
  disabled?: boolean;
}

export function ValveRow({ slot, adjuster, entry, reading, series, sizesMm, unit, onChange, planned, problems, disabled }: Props) {
  const headingId = `valve-${slot.valveId}`;
  return (
    <section
      aria-labelledby={headingId}
      className={`flex flex-col gap-4 rounded-card border-2 bg-paper-raised p-4 ${problems.length ? 'border-state-stop' : 'border-ink-line'}`}
    >
      <header className="flex flex-wrap items-baseline justify-between gap-x-4 gap-y-2">
        <div>
          <h3 id={headingId} className="text-reading font-bold">{slot.label}</h3>
          <p className="num text-lg">
            Cold spec <strong>{specText(slot.specMinMm, slot.specMaxMm, unit)}</strong>
          </p>
          {slot.lastAsFoundMm != null && <p className="num text-ink-soft">Last check found {clearanceText(slot.lastAsFoundMm, unit)}</p>}
        </div>
        <SpecBadge state={reading.spec} what={reading.asLeftMm != null ? 'As left' : 'As found'} remeasure={reading.needsAsLeft} />
      </header>
      {problems.length > 0 && (
        <ul role="alert" className="list-none rounded-card bg-state-stop-soft p-3 font-medium text-state-stop">
          {problems.map((p) => (
            <li key={p}>⚠ {p}</li>
          ))}
        </ul>
      )}
      <div className="grid gap-6 lg:grid-cols-2">
        <AsFoundEntry label={slot.label} entry={entry} reading={reading} series={series} unit={unit} onChange={onChange} disabled={disabled} />
        <AdjustSection slot={slot} adjuster={adjuster} entry={entry} reading={reading} sizesMm={sizesMm} unit={unit} onChange={onChange} planned={planned} disabled={disabled} />
      </div>
    </section>
  );
}
