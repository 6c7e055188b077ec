import { Router, type Request } from 'express';
import type { AppContext } from '../app';
import { currentUser, requireRole } from '../middleware/auth';
import { validate } from '../middleware/validate';
import { IdParamsSchema } from '../../shared/schemas/common';
import {
  BayCreateSchema, BayPatchSchema, CapacityQuerySchema, TimeOffCreateSchema, WeekHoursSchema, WorkPatternCreateSchema, WorkPatternPatchSchema,
  type BayCreate, type BayPatch, type CapacityQuery, type TimeOffCreate, type WeekHours, type WorkPatternCreate, type WorkPatternPatch,
} from '../../shared/schemas/capacity';
import { createBay, deleteBay, patchBay, putHours, readCapacity } from '../services/capacity';
import { createPattern, createTimeOff, deletePattern, deleteTimeOff, patchPattern } from '../services/capacity-people';

const PLANNERS = ['manager', 'admin'] as const;

export function capacityRoutes(ctx: AppContext) {
  const r = Router();
  const db = ctx.database.db;
  const id = (req: Request) => (req.valid.params as { id: string }).id;
  const byId = validate({ params: IdParamsSchema });

  r.get('/capacity', requireRole('manager', 'admin', 'technician'), validate({ query: CapacityQuerySchema }), async (req, res) => {
    res.json(await readCapacity(db, currentUser(req), req.valid.query as CapacityQuery));
  });

  r.put('/sites/:id/hours', requireRole(...PLANNERS), validate({ params: IdParamsSchema, body: WeekHoursSchema }), async (req, res) => {
    res.json(await putHours(db, currentUser(req), id(req), (req.valid.body as WeekHours).hours, ctx.now()));
  });

  r.post('/sites/:id/bays', requireRole(...PLANNERS), validate({ params: IdParamsSchema, body: BayCreateSchema }), async (req, res) => {
    res.status(201).json(await createBay(db, currentUser(req), id(req), (req.valid.body as BayCreate).name, ctx.now()));
  });

  r.patch('/bays/:id', requireRole(...PLANNERS), validate({ params: IdParamsSchema, body: BayPatchSchema }), async (req, res) => {
    res.json(await patchBay(db, currentUser(req), id(req), req.valid.body as BayPatch, ctx.now()));
  });

  r.delete('/bays/:id', requireRole(...PLANNERS), byId, async (req, res) => {
    res.json(await deleteBay(db, currentUser(req), id(req), ctx.now()));
  });

  r.post('/work-patterns', requireRole(...PLANNERS), validate({ body: WorkPatternCreateSchema }), async (req, res) => {
    res.status(201).json(await createPattern(db, currentUser(req), req.valid.body as WorkPatternCreate, ctx.now()));
  });

  r.patch('/work-patterns/:id', requireRole(...PLANNERS), validate({ params: IdParamsSchema, body: WorkPatternPatchSchema }), async (req, res) => {
    res.json(await patchPattern(db, currentUser(req), id(req), req.valid.body as WorkPatternPatch, ctx.now()));
  });

  r.delete('/work-patterns/:id', requireRole(...PLANNERS), byId, async (req, res) => {
    res.json(await deletePattern(db, currentUser(req), id(req), ctx.now()));
  });

  r.post('/time-off', requireRole('manager', 'admin', 'technician'), validate({ body: TimeOffCreateSchema }), async (req, res) => {
    res.status(201).json(await createTimeOff(db, currentUser(req), req.valid.body as TimeOffCreate, ctx.now()));
  });

  r.delete('/time-off/:id', requireRole('manager', 'admin', 'technician'), byId, async (req, res) => {
    res.json(await deleteTimeOff(db, currentUser(req), id(req), ctx.now()));
  });
  return r;
}
