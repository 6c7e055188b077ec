import { Router } from 'express';
import type { AppContext } from '../app';
import { currentUser, requireRole } from '../middleware/auth';
import { validated } from '../middleware/validate';
import { IdParamsSchema } from '../../shared/schemas/common';
import {
  BayCreateSchema, BayPatchSchema, CapacityQuerySchema, TimeOffCreateSchema, WeekHoursSchema, WorkPatternCreateSchema, WorkPatternPatchSchema,
  } from '../../shared/schemas/capacity';
import { createBay, deleteBay, patchBay, putHours, readCapacity } from '../services/capacity';
import { createPattern, createTimeOff, deletePattern, deleteTimeOff, patchPattern } from '../services/capacity-people';

const PLANNERS = ['manager', 'admin'] as const;

export function capacityRoutes(ctx: AppContext) {
  const r = Router();
  const db = ctx.database.db;

  r.get('/capacity', requireRole('manager', 'admin', 'technician'), ...validated({ query: CapacityQuerySchema }, async (req, res, v) => {
    res.json(await readCapacity(db, currentUser(req), v.query));
  }));

  r.put('/sites/:id/hours', requireRole(...PLANNERS), ...validated({ params: IdParamsSchema, body: WeekHoursSchema }, async (req, res, v) => {
    res.json(await putHours(db, currentUser(req), v.params.id, v.body.hours, ctx.now()));
  }));

  r.post('/sites/:id/bays', requireRole(...PLANNERS), ...validated({ params: IdParamsSchema, body: BayCreateSchema }, async (req, res, v) => {
    res.status(201).json(await createBay(db, currentUser(req), v.params.id, v.body.name, ctx.now()));
  }));

  r.patch('/bays/:id', requireRole(...PLANNERS), ...validated({ params: IdParamsSchema, body: BayPatchSchema }, async (req, res, v) => {
    res.json(await patchBay(db, currentUser(req), v.params.id, v.body, ctx.now()));
  }));

  r.delete('/bays/:id', requireRole(...PLANNERS), ...validated({ params: IdParamsSchema }, async (req, res, v) => {
    res.json(await deleteBay(db, currentUser(req), v.params.id, ctx.now()));
  }));

  r.post('/work-patterns', requireRole(...PLANNERS), ...validated({ body: WorkPatternCreateSchema }, async (req, res, v) => {
    res.status(201).json(await createPattern(db, currentUser(req), v.body, ctx.now()));
  }));

  r.patch('/work-patterns/:id', requireRole(...PLANNERS), ...validated({ params: IdParamsSchema, body: WorkPatternPatchSchema }, async (req, res, v) => {
    res.json(await patchPattern(db, currentUser(req), v.params.id, v.body, ctx.now()));
  }));

  r.delete('/work-patterns/:id', requireRole(...PLANNERS), ...validated({ params: IdParamsSchema }, async (req, res, v) => {
    res.json(await deletePattern(db, currentUser(req), v.params.id, ctx.now()));
  }));

  r.post('/time-off', requireRole('manager', 'admin', 'technician'), ...validated({ body: TimeOffCreateSchema }, async (req, res, v) => {
    res.status(201).json(await createTimeOff(db, currentUser(req), v.body, ctx.now()));
  }));

  r.delete('/time-off/:id', requireRole('manager', 'admin', 'technician'), ...validated({ params: IdParamsSchema }, async (req, res, v) => {
    res.json(await deleteTimeOff(db, currentUser(req), v.params.id, ctx.now()));
  }));
  return r;
}
