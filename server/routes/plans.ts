import { Router } from 'express';
import { z } from 'zod';
import type { AppContext } from '../app';
import { currentUser, requireRole, signedIn } from '../middleware/auth';
import { validate } from '../middleware/validate';
import { IdParamsSchema, IdSchema } from '../../shared/schemas/common';
import { ModelUpsertSchema, ServiceItemUpsertSchema, type ModelUpsert, type ServiceItemUpsert } from '../../shared/schemas/plans';
import { createModel, deleteItem, modelDetail, updateModel, upsertItem } from '../services/plans';

const ItemParams = z.object({ id: IdSchema, itemId: IdSchema });

export function planRoutes(ctx: AppContext) {
  const r = Router();
  const db = ctx.database.db;
  const p = (req: { valid: { params?: unknown } }) => req.valid.params as { id: string; itemId: string };

  r.get('/models/:id', signedIn(), validate({ params: IdParamsSchema }), async (req, res) => {
    res.json(await modelDetail(db, p(req).id));
  });

  r.post('/models', requireRole('manager'), validate({ body: ModelUpsertSchema }), async (req, res) => {
    const id = await createModel(db, currentUser(req).id, req.valid.body as ModelUpsert);
    res.status(201).json(await modelDetail(db, id));
  });

  r.put('/models/:id', requireRole('manager'), validate({ params: IdParamsSchema, body: ModelUpsertSchema }), async (req, res) => {
    const bikesRecomputed = await updateModel(db, currentUser(req).id, p(req).id, req.valid.body as ModelUpsert, ctx.now());
    res.json({ ...(await modelDetail(db, p(req).id)), bikesRecomputed });
  });

  r.post('/models/:id/items', requireRole('manager'), validate({ params: IdParamsSchema, body: ServiceItemUpsertSchema }), async (req, res) => {
    const out = await upsertItem(db, currentUser(req).id, p(req).id, null, req.valid.body as ServiceItemUpsert, ctx.now());
    res.status(201).json({ ...(await modelDetail(db, p(req).id)), ...out });
  });

  r.put('/models/:id/items/:itemId', requireRole('manager'), validate({ params: ItemParams, body: ServiceItemUpsertSchema }), async (req, res) => {
    const out = await upsertItem(db, currentUser(req).id, p(req).id, p(req).itemId, req.valid.body as ServiceItemUpsert, ctx.now());
    res.json({ ...(await modelDetail(db, p(req).id)), ...out });
  });

  r.delete('/models/:id/items/:itemId', requireRole('manager'), validate({ params: ItemParams }), async (req, res) => {
    const bikesRecomputed = await deleteItem(db, currentUser(req).id, p(req).id, p(req).itemId, ctx.now());
    res.json({ ...(await modelDetail(db, p(req).id)), bikesRecomputed });
  });
  return r;
}
