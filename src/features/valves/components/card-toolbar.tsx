import { Segmented } from '../../../components/ui/segmented';
import type { BladeKind } from '../../../../shared/domain/feeler';
import type { ClearanceUnit } from '../clearance-format';
import type { DraftSource } from '../card-draft';
import type { SyncState } from '../use-card-draft';

interface Props {
  gauge: BladeKind;
  unit: ClearanceUnit;
  onGauge: (g: BladeKind) => void;
  onUnit: (u: ClearanceUnit) => void;
  sync: SyncState;
  restoredFrom: DraftSource;
}

const time = (iso: string) => new Date(iso).toLocaleTimeString('en-GB', { hour: '2-digit', minute: '2-digit' });

function SyncLine({ sync, restoredFrom }: { sync: SyncState; restoredFrom: DraftSource }) {
  if (sync.kind === 'saving') return <>Saving to Lashline…</>;
  if (sync.kind === 'saved') return <>✓ Saved on this tablet and to Lashline at {time(sync.at)}.</>;
  if (sync.kind === 'failed') return <span className="text-state-stop">⚠ Kept on this tablet only, not yet in Lashline: {sync.message}</span>;
  if (restoredFrom === 'server') return <>Opened the readings last saved to Lashline (from this or another tablet).</>;
  if (restoredFrom === 'device') return <>Opened the readings kept on this tablet.</>;
  return <>Readings are saved as you go, on this tablet and to Lashline.</>;
}

export function CardToolbar({ gauge, unit, onGauge, onUnit, sync, restoredFrom }: Props) {
  return (
    <div className="flex flex-wrap items-end gap-x-6 gap-y-3">
      <Segmented legend="Feeler gauge set" value={gauge} onChange={onGauge} options={[{ value: 'metric', label: 'Metric (mm)' }, { value: 'inch', label: 'Inch' }]} />
      <Segmented legend="Show clearances in" value={unit} onChange={onUnit} options={[{ value: 'mm', label: 'mm' }, { value: 'in', label: 'inches' }]} />
      <p aria-live="polite" className="min-h-tap flex-1 basis-64 content-center text-ink-soft">
        <SyncLine sync={sync} restoredFrom={restoredFrom} />
      </p>
    </div>
  );
}
