import type { BikeSummary } from '../../shared/schemas/bikes';
import type { DueItem } from '../../shared/schemas/due';

export interface RideVerdict {
  mayRide: boolean;
  reasons: string[];
}

/** Whether the desk may hand the bike to a rider: not grounded, nothing safety-critical overdue. */
export function rideVerdict(bike: BikeSummary, due: DueItem[]): RideVerdict {
  const reasons: string[] = [];
  if (bike.status === 'out_of_service') reasons.push(`Grounded: ${bike.statusReason ?? 'no reason recorded'}`);
  if (bike.status === 'in_workshop') reasons.push('In the workshop: not released yet.');
  if (bike.status === 'retired') reasons.push('Retired from the fleet.');
  for (const d of due) {
    // The grounding reason may already name the item.
    if (d.safetyCritical && d.status === 'overdue' && !reasons.some((r) => r.includes(d.item))) reasons.push(`Overdue safety-critical work: ${d.item}.`);
  }
  return { mayRide: reasons.length === 0, reasons };
}
