import { Router } from 'express';
import { eq } from 'drizzle-orm';
import type { AppContext } from '../app';
import { currentUser, requireRole, signedIn } from '../middleware/auth';
import { validated } from '../middleware/validate';
import { ReadCache } from '../cache/read-cache';
import { bikeModels, bikes } from '../db/schema';
import { IdParamsSchema } from '../../shared/schemas/common';
import {
  BikeCreateSchema,
  BikeListQuerySchema,
  BikeStatusChangeSchema,
  BikeUpdateSchema,
  } from '../../shared/schemas/bikes';
import { canSeeSite } from '../../shared/domain/policies';
import { audit, diff } from '../audit';
import { badRequest, conflict, forbidden, notFound } from '../http-error';
import { fleetNumberTaken, getBike, listBikes, readingsOf } from '../services/bikes';
import { listDue } from '../services/due-list';
import { rideVerdict } from '../services/ride-check';
import { bikeTimeline } from '../services/timeline';
import { replanAfter } from '../services/replan';
import { CheckInSchema } from '../../shared/schemas/due';

const fleetTaken = (n: string) =>
  conflict(`Fleet number ${n} is already on another bike. Fleet numbers must be unique.`, [
    { path: 'fleetNumber', message: 'Already in use.' },
  ]);

export function bikeRoutes(ctx: AppContext) {
  const r = Router();
  const db = ctx.database.db;

  async function checkRefs(user: Express.User, modelId?: string, siteId?: string) {
    if (siteId && !canSeeSite(user, siteId)) throw forbidden('You can only add bikes to your own sites.');
    if (modelId) {
      const [m] = await db.select({ id: bikeModels.id }).from(bikeModels).where(eq(bikeModels.id, modelId));
      if (!m) throw badRequest('Choose a model from the list.', [{ path: 'modelId', message: 'Unknown model.' }]);
    }
  }

  r.get('/', signedIn(), ...validated({ query: BikeListQuerySchema }, async (req, res, v) => {
    const { siteIds } = currentUser(req);
    const q = v.query;
    await ctx.readCache.send(req, res, ReadCache.key('bikes', siteIds, q, ctx.now()), async () => ({ items: await listBikes(db, siteIds, q) }));
  }));

  r.get('/:id', signedIn(), ...validated({ params: IdParamsSchema }, async (req, res, v) => {
    const { id } = v.params;
    const bike = await getBike(db, currentUser(req).siteIds, id);
    if (!bike) throw notFound('That bike');
    const due = await listDue(db, [bike.site.id], { bikeId: id, all: true }, ctx.now());
    res.json({ bike, readings: await readingsOf(db, id), due, ride: rideVerdict(bike, due) });
  }));

  r.get('/:id/timeline', signedIn(), ...validated({ params: IdParamsSchema }, async (req, res, v) => {
    const { id } = v.params;
    if (!(await getBike(db, currentUser(req).siteIds, id))) throw notFound('That bike');
    res.json({ items: await bikeTimeline(db, id) });
  }));

  r.post(
    '/:id/check-ins',
    requireRole('desk', 'technician', 'manager', 'admin'),
    ...validated({ params: IdParamsSchema, body: CheckInSchema }, async (req, res, v) => {
      const user = currentUser(req);
      const { id } = v.params;
      const { reading, grounded, defectId, bike, due } = await ctx.checkIns.record(user, id, v.body, ctx.now());
      // A new reading moves km-based due dates; the bike's visit follows when it has work raised, or
      // when the check-in grounded it. The answer does not wait for the re-plan.
      if (grounded || due.some((d) => d.taskId)) void replanAfter(db, { siteIds: [bike.site.id], bikeIds: [id], why: `check-in of ${bike.fleetNumber}` }, ctx.now());
      res.status(201).json({
        reading: { id: reading.id, date: reading.date, value: reading.value, unit: reading.unit, odometerKm: reading.odometerKm, reset: reading.reset },
        bike,
        due,
        grounded,
        defectId,
        ride: rideVerdict(bike, due),
      });
    }),
  );

  r.post('/', requireRole('manager', 'admin'), ...validated({ body: BikeCreateSchema }, async (req, res, v) => {
    const user = currentUser(req);
    const body = v.body;
    await checkRefs(user, body.modelId, body.siteId);
    const id = await db.transaction(async (tx) => {
      if (await fleetNumberTaken(tx, body.fleetNumber)) throw fleetTaken(body.fleetNumber);
      const [row] = await tx.insert(bikes).values(body).returning({ id: bikes.id });
      await audit(tx, { userId: user.id, action: 'create', entity: 'bike', entityId: row.id, changes: body });
      return row.id;
    });
    res.status(201).json({ bike: await getBike(db, user.siteIds, id) });
  }));

  r.patch('/:id', requireRole('manager', 'admin'), ...validated({ params: IdParamsSchema, body: BikeUpdateSchema }, async (req, res, v) => {
    const user = currentUser(req);
    const { id } = v.params;
    const body = v.body;
    await checkRefs(user, body.modelId, body.siteId);
    await db.transaction(async (tx) => {
      const [before] = await tx.select().from(bikes).where(eq(bikes.id, id));
      if (!before || !canSeeSite(user, before.siteId)) throw notFound('That bike');
      if (body.fleetNumber && (await fleetNumberTaken(tx, body.fleetNumber, id))) throw fleetTaken(body.fleetNumber);
      await tx.update(bikes).set({ ...body, updatedAt: ctx.now() }).where(eq(bikes.id, id));
      await audit(tx, { userId: user.id, action: 'update', entity: 'bike', entityId: id, changes: diff(before, body) });
    });
    res.json({ bike: await getBike(db, user.siteIds, id) });
  }));

  r.post(
    '/:id/status',
    requireRole('manager', 'technician', 'admin'),
    ...validated({ params: IdParamsSchema, body: BikeStatusChangeSchema }, async (req, res, v) => {
      const user = currentUser(req);
      const { id } = v.params;
      const body = v.body;
      await db.transaction(async (tx) => {
        const [before] = await tx.select().from(bikes).where(eq(bikes.id, id));
        if (!before || !canSeeSite(user, before.siteId)) throw notFound('That bike');
        if (body.status === 'retired' && user.role === 'technician') throw forbidden('Only a manager can retire a bike.');
        const reason = body.status === 'in_service' ? null : (body.reason ?? null);
        await tx.update(bikes).set({ status: body.status, statusReason: reason, updatedAt: ctx.now() }).where(eq(bikes.id, id));
        await audit(tx, {
          userId: user.id,
          action: 'status',
          entity: 'bike',
          entityId: id,
          changes: { status: [before.status, body.status], reason: [before.statusReason, reason] },
        });
      });
      res.json({ bike: await getBike(db, user.siteIds, id) });
    }),
  );
  return r;
}
