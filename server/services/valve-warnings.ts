import type { Db } from '../db/client';

export interface ValveWarning {
  bikeId?: string;
  fleetNumber: string;
  valve: string;
  message: string;
}

/** Valves whose clearance trend reaches the spec minimum before their next check. */
export async function valveWarningsFor(_db: Db, _siteIds: string[]): Promise<ValveWarning[]> {
  return [];
}
