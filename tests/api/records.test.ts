import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import { agent, manualClock, testApp, type Agent, type TestContext } from '../support/test-app';
import { PASSWORD, makeBike, makeModel, makeServiceItem, world } from '../support/factories';
import { defects, odometerReadings, serviceReadings, serviceRecords, valveChecks, valveReadings } from '../../server/db/schema';

const clock = manualClock('2026-06-15T10:00:00Z');
let t: TestContext;
let w: Awaited<ReturnType<typeof world>>;
let bike: { id: string; fleetNumber: string };
let milesBike: { id: string };
const as: Record<string, Agent> = {};

beforeAll(async () => {
  t = await testApp({ now: clock.now });
  const db = t.database.db;
  w = await world(db);
  // A single with one intake and one exhaust valve, specs as the demo's small single (invented).
  const model = await makeModel(db, { cylinders: 1, intakeValvesPerCylinder: 1, exhaustValvesPerCylinder: 1, adjuster: 'screw-and-locknut', intakeMinUm: 50, intakeMaxUm: 90, exhaustMinUm: 80, exhaustMaxUm: 120 });
  const oil = await makeServiceItem(db, model.id, { name: 'Engine oil and filter' });
  const valves = await makeServiceItem(db, model.id, { name: 'Valve clearance check', category: 'valves', everyKm: 6000, everyMonths: 12 });
  const tyres = await makeServiceItem(db, model.id, { name: 'Brake pads and tyres', category: 'tyres', safetyCritical: true });
  bike = await makeBike(db, model.id, w.siteA.id, { fleetNumber: 'SM-03', vin: 'SMH0A1B2C3D4E5F67', registration: 'SM26 QST', inServiceDate: '2025-01-01' });
  const tech = w.people.technician.id;
  await db.insert(odometerReadings).values([
    { bikeId: bike.id, date: '2025-03-01', value: 1000, unit: 'km', odometerKm: 1000, recordedBy: tech },
    { bikeId: bike.id, date: '2025-09-01', value: 6200, unit: 'km', odometerKm: 6200, recordedBy: tech },
  ]);
  const done = await db
    .insert(serviceRecords)
    .values([
      { bikeId: bike.id, serviceItemId: oil.id, date: '2025-03-01', odometerKm: 1000, doneBy: tech, notes: 'First service, oil "10W-40", filter\r\nand washer' },
      // Two services of one visit: signed off one after the other (one insert would give them the same time).
      { bikeId: bike.id, serviceItemId: valves.id, date: '2025-09-01', odometerKm: 6200, doneBy: tech, notes: 'Exhaust adjusted back to mid-spec.', createdAt: new Date('2025-09-01T10:00:00Z') },
      { bikeId: bike.id, serviceItemId: tyres.id, date: '2025-09-01', odometerKm: 6200, doneBy: tech, createdAt: new Date('2025-09-01T11:00:00Z') },
    ])
    .returning();
  const [vc] = await db.insert(valveChecks).values({ bikeId: bike.id, date: '2025-09-01', odometerKm: 6200, checkedBy: tech }).returning();
  await db.insert(valveReadings).values([
    { checkId: vc.id, cylinder: 1, side: 'intake', position: 1, asFoundUm: 70 },
    { checkId: vc.id, cylinder: 1, side: 'exhaust', position: 1, asFoundUm: 60, asLeftUm: 100 },
  ]);
  const pads = done.find((d) => d.serviceItemId === tyres.id)!;
  await db.insert(serviceReadings).values({ serviceRecordId: pads.id, label: 'Front tyre tread', kind: 'measure', unit: 'mm', value: 2.5, min: 1, max: null });
  await db.insert(defects).values({ bikeId: bike.id, category: 'lights', text: 'Rear indicator cracked', reportedBy: w.people.desk.id });
  milesBike = await makeBike(db, model.id, w.siteA.id, { odometerUnit: 'mi', inServiceDate: '2025-01-01' });
  await db.insert(odometerReadings).values({ bikeId: milesBike.id, date: '2025-05-01', value: 1000, unit: 'mi', odometerKm: 1609.344 });
  await db.insert(serviceRecords).values({ bikeId: milesBike.id, serviceItemId: oil.id, date: '2025-05-01', odometerKm: 1609.344, doneBy: tech });

  for (const role of ['manager', 'technician', 'technicianB'] as const) {
    as[role] = await agent(t.app);
    await as[role].login(w.people[role].email, PASSWORD);
  }
  as.signedOut = await agent(t.app);
  const grounded = await as.manager.post(`/api/bikes/${bike.id}/status`).send({ status: 'out_of_service', reason: 'Rear indicator cracked' });
  expect(grounded.status).toBe(200);
});
afterAll(() => t.close());

describe('GET /api/bikes/:id/service-record', () => {
  it('is refused signed out, and another site’s bike is not found', async () => {
    expect((await as.signedOut.get(`/api/bikes/${bike.id}/service-record`)).status).toBe(401);
    expect((await as.technicianB.get(`/api/bikes/${bike.id}/service-record`)).status).toBe(404);
    expect((await as.technician.get('/api/bikes/not-an-id/service-record')).status).toBe(404);
  });

  it('holds the bike, every service in order with who signed it off, the valve readings with spec, defects and status changes', async () => {
    const res = await as.technician.get(`/api/bikes/${bike.id}/service-record`);
    expect(res.status).toBe(200);
    const r = res.body;
    expect(r.site.name).toBe(w.siteA.name);
    expect(r.bike).toMatchObject({ fleetNumber: 'SM-03', vin: 'SMH0A1B2C3D4E5F67', registration: 'SM26 QST', status: 'out_of_service' });
    expect(r.services.map((s: { item: string }) => s.item)).toEqual(['Engine oil and filter', 'Valve clearance check', 'Brake pads and tyres']);
    expect(r.services.every((s: { signedOffBy: string }) => s.signedOffBy === w.people.technician.name)).toBe(true);
    const valves = r.services[1].valveReadings;
    expect(valves).toEqual([
      expect.objectContaining({ label: 'Intake', asFoundMm: 0.07, asLeftMm: null, specMinMm: 0.05, specMaxMm: 0.09, inSpec: true }),
      // Found at 0.06 mm, below the 0.08 mm minimum, and left at 0.10 mm: in spec as left.
      expect.objectContaining({ label: 'Exhaust', asFoundMm: 0.06, asLeftMm: 0.1, specMinMm: 0.08, specMaxMm: 0.12, inSpec: true }),
    ]);
    expect(r.services[2].readings).toEqual([expect.objectContaining({ label: 'Front tyre tread', value: 2.5, unit: 'mm', min: 1 })]);
    expect(r.defects).toEqual([expect.objectContaining({ category: 'lights', reportedBy: w.people.desk.name })]);
    expect(r.statusChanges).toEqual([expect.objectContaining({ from: 'in_service', to: 'out_of_service', reason: 'Rear indicator cracked', by: w.people.manager.name })]);
  });
});

describe('GET /api/bikes/:id/history.csv', () => {
  const parse = (text: string) => Papa.parse<Record<string, string>>(text, { header: true, skipEmptyLines: true });

  it('is an RFC 4180 file (CRLF) that parses back: services and readings, oldest first', async () => {
    const res = await as.technician.get(`/api/bikes/${bike.id}/history.csv`);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toContain('text/csv');
    expect(res.headers['content-disposition']).toContain('SM-03-history.csv');
    expect(res.text.endsWith('\r\n')).toBe(true);
    const { data, errors, meta } = parse(res.text);
    expect(errors).toEqual([]);
    expect(meta.fields).toEqual(['date', 'record', 'item', 'odometer', 'unit', 'odometer_km', 'signed_off_by', 'notes', 'readings']);
    expect(data.map((d) => [d.date, d.record])).toEqual([
      ['2025-03-01', 'odometer'], ['2025-03-01', 'service'], ['2025-09-01', 'odometer'], ['2025-09-01', 'service'], ['2025-09-01', 'service'],
    ]);
    // Quotes, a comma and a line break inside the notes survive the round trip (RFC 4180 rules 6 and 7).
    expect(data[1].notes).toBe('First service, oil "10W-40", filter\r\nand washer');
    expect(data[1].signed_off_by).toBe(w.people.technician.name);
    const valve = data.find((d) => d.item === 'Valve clearance check')!;
    expect(valve.readings).toContain('Exhaust 0.06 mm, left 0.10 mm, spec 0.08–0.12 mm');
  });

  it('gives a miles bike’s odometer in miles and in km (1 mile = 1.609344 km exactly, 1959 agreement)', async () => {
    const { data } = parse((await as.technician.get(`/api/bikes/${milesBike.id}/history.csv`)).text);
    const service = data.find((d) => d.record === 'service')!;
    expect([Number(service.odometer), service.unit, Number(service.odometer_km)]).toEqual([1000, 'mi', 1609.3]);
  });

  it('is refused signed out and hides another site’s bike', async () => {
    expect((await as.signedOut.get(`/api/bikes/${bike.id}/history.csv`)).status).toBe(401);
    expect((await as.technicianB.get(`/api/bikes/${bike.id}/history.csv`)).status).toBe(404);
  });
});
