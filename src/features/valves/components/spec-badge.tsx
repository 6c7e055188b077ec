import { ToneBadge } from '../../../components/ui/tone-badge';
import type { SpecState } from '../card-state';

/** Tight is the dangerous side (a valve that cannot close burns); loose mainly ticks. */
export function SpecBadge({ state, what = 'As left', remeasure }: { state: SpecState | null; what?: string; remeasure?: boolean }) {
  if (state === null && remeasure) return <ToneBadge tone="info" icon="◔">Adjusted: measure as left</ToneBadge>;
  if (state === null) return <ToneBadge tone="neutral" icon="…">No reading yet</ToneBadge>;
  if (state === 'in') return <ToneBadge tone="ok" icon="✓">{what}: in spec</ToneBadge>;
  if (state === 'tight') return <ToneBadge tone="stop" icon="▼">{what}: too tight</ToneBadge>;
  return <ToneBadge tone="soon" icon="▲">{what}: too loose</ToneBadge>;
}
