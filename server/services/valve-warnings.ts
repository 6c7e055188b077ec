import type { DbOrTx } from '../db/client';
import { trendsForBikes, trendsForDueInputs, type BikeTrends } from './valve-history';
import type { DueInputs } from './due-data';

export interface ValveWarning {
  bikeId: string;
  fleetNumber: string;
  valve: string;
  message: string;
  kmAtSpecMin: number | null;
}

const km = (v: number | null) => (v == null ? '—' : `${Math.round(v).toLocaleString('en-GB')} km`);

/** Valves whose clearance trend reaches the spec minimum before their next scheduled check. */
export async function valveWarningsFor(db: DbOrTx, siteIds: string[], bikeIds?: string[]): Promise<ValveWarning[]> {
  return warningsOf(await trendsForBikes(db, bikeIds ? { bikeIds } : { siteIds }));
}

/** The same warnings for every bike the due scan has just read, from its own inputs. */
export async function valveWarningsForScan(db: DbOrTx, inputs: DueInputs): Promise<ValveWarning[]> {
  return warningsOf(await trendsForDueInputs(db, inputs));
}

function warningsOf(trends: BikeTrends[]): ValveWarning[] {
  const out: ValveWarning[] = [];
  for (const b of trends) {
    for (const v of b.valves) {
      if (!v.warning) continue;
      out.push({
        bikeId: b.bikeId,
        fleetNumber: b.fleetNumber,
        valve: v.label,
        kmAtSpecMin: v.kmAtSpecMin,
        message: `closing ${v.closureMmPer1000Km?.toFixed(4) ?? '—'} mm per 1,000 km; reaches the ${v.specMinMm.toFixed(2)} mm minimum near ${km(v.kmAtSpecMin)}, before the next check at ${km(v.nextCheckKm)}. Bring the valve check forward.`,
      });
    }
  }
  return out;
}
