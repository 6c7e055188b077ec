import type { DbOrTx } from '../db/client';
import { bikeModels, bikes, sites } from '../db/schema';
import type { RowError } from '../../shared/domain/csv-rows';
import { timesProblem } from '../../shared/domain/bookings';

// What a booking may name: sites, bikes and models, read once and checked without more queries
// (a CSV file of many rows and a single booking go through the same checks).

export interface RefSite {
  id: string;
  name: string;
  timeZone: string;
  mine: boolean;
}
export interface RefBike {
  id: string;
  fleetNumber: string;
  siteId: string;
  modelId: string;
  retired: boolean;
}
export interface BookingRefs {
  sites: Map<string, RefSite>;
  siteByName: Map<string, RefSite>;
  bikes: Map<string, RefBike>;
  bikeByFleet: Map<string, RefBike>;
  models: Map<string, { id: string; name: string }>;
  modelByName: Map<string, string>;
  /** Bikes of a model at a site that are not retired: "siteId/modelId" → count. */
  counts: Map<string, number>;
}

const key = (s: string) => s.trim().toLowerCase();

export async function loadRefs(db: DbOrTx, siteIds: readonly string[]): Promise<BookingRefs> {
  // One after the other: inside a transaction there is one connection.
  const siteRows = await db.select({ id: sites.id, name: sites.name, timeZone: sites.timeZone }).from(sites);
  const bikeRows = await db.select({ id: bikes.id, fleetNumber: bikes.fleetNumber, siteId: bikes.siteId, modelId: bikes.modelId, status: bikes.status }).from(bikes);
  const modelRows = await db.select({ id: bikeModels.id, name: bikeModels.name }).from(bikeModels);
  const refs: BookingRefs = {
    sites: new Map(), siteByName: new Map(), bikes: new Map(), bikeByFleet: new Map(), models: new Map(), modelByName: new Map(), counts: new Map(),
  };
  for (const s of siteRows) {
    const site = { ...s, mine: siteIds.includes(s.id) };
    refs.sites.set(s.id, site);
    refs.siteByName.set(key(s.name), site);
  }
  for (const b of bikeRows) {
    const bike = { id: b.id, fleetNumber: b.fleetNumber, siteId: b.siteId, modelId: b.modelId, retired: b.status === 'retired' };
    refs.bikes.set(b.id, bike);
    refs.bikeByFleet.set(key(b.fleetNumber), bike);
    if (!bike.retired) refs.counts.set(`${b.siteId}/${b.modelId}`, (refs.counts.get(`${b.siteId}/${b.modelId}`) ?? 0) + 1);
  }
  for (const m of modelRows) {
    refs.models.set(m.id, m);
    refs.modelByName.set(key(m.name), m.id);
  }
  return refs;
}

export interface BookingDraft {
  siteId: string;
  bikeId: string | null;
  modelId: string | null;
  quantity: number;
  start: number;
  end: number;
}

/** What is wrong with a booking against the fleet, field by field; empty when it may be stored. */
export function refProblems(refs: BookingRefs, b: BookingDraft, fields = { bike: 'bikeId', model: 'modelId' }): RowError[] {
  const errors: RowError[] = [];
  const site = refs.sites.get(b.siteId);
  if (!site?.mine) return [{ field: 'siteId', message: 'That site is not one of yours. Book at a site you work at.' }];
  const times = timesProblem(b.start, b.end);
  if (times) errors.push({ field: 'end', message: times });
  if (b.bikeId) {
    const bike = refs.bikes.get(b.bikeId);
    const home = bike && refs.sites.get(bike.siteId);
    if (!bike || !home?.mine) errors.push({ field: fields.bike, message: 'No bike of yours has that id. Pick the bike from your fleet.' });
    else if (bike.siteId !== b.siteId) errors.push({ field: fields.bike, message: `${bike.fleetNumber} works from ${home.name}, not ${site.name}. Book it at ${home.name}, or pick a bike at ${site.name}.` });
    else if (bike.retired) errors.push({ field: fields.bike, message: `${bike.fleetNumber} is retired and cannot be booked.` });
  } else if (b.modelId) {
    const model = refs.models.get(b.modelId);
    const have = refs.counts.get(`${b.siteId}/${b.modelId}`) ?? 0;
    if (!model) errors.push({ field: fields.model, message: 'No model has that id. Pick a model from the list.' });
    else if (b.quantity > have)
      errors.push({ field: 'quantity', message: `${site.name} has ${have} ${model.name} bike${have === 1 ? '' : 's'}; ${b.quantity} cannot be booked. Ask for at most ${have}${have ? '' : ' (move a bike here first)'}.` });
  }
  return errors;
}
