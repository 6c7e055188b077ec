import { Router } from 'express';
import { z } from 'zod';
import type { AppContext } from '../app';
import { currentUser, requireRole, signedIn } from '../middleware/auth';
import { validated } from '../middleware/validate';
import { IdParamsSchema, IdSchema } from '../../shared/schemas/common';
import { ModelUpsertSchema, ServiceItemUpsertSchema } from '../../shared/schemas/plans';
import { createModel, deleteItem, modelDetail, updateModel, upsertItem } from '../services/plans';

const ItemParams = z.object({ id: IdSchema, itemId: IdSchema });

export function planRoutes(ctx: AppContext) {
  const r = Router();
  const db = ctx.database.db;

  r.get('/models/:id', signedIn(), ...validated({ params: IdParamsSchema }, async (req, res, v) => {
    res.json(await modelDetail(db, v.params.id));
  }));

  r.post('/models', requireRole('manager'), ...validated({ body: ModelUpsertSchema }, async (req, res, v) => {
    const id = await createModel(db, currentUser(req).id, v.body);
    res.status(201).json(await modelDetail(db, id));
  }));

  r.put('/models/:id', requireRole('manager'), ...validated({ params: IdParamsSchema, body: ModelUpsertSchema }, async (req, res, v) => {
    const bikesRecomputed = await updateModel(db, currentUser(req).id, v.params.id, v.body, ctx.now());
    res.json({ ...(await modelDetail(db, v.params.id)), bikesRecomputed });
  }));

  r.post('/models/:id/items', requireRole('manager'), ...validated({ params: IdParamsSchema, body: ServiceItemUpsertSchema }, async (req, res, v) => {
    const out = await upsertItem(db, currentUser(req).id, v.params.id, null, v.body, ctx.now());
    res.status(201).json({ ...(await modelDetail(db, v.params.id)), ...out });
  }));

  r.put('/models/:id/items/:itemId', requireRole('manager'), ...validated({ params: ItemParams, body: ServiceItemUpsertSchema }, async (req, res, v) => {
    const out = await upsertItem(db, currentUser(req).id, v.params.id, v.params.itemId, v.body, ctx.now());
    res.json({ ...(await modelDetail(db, v.params.id)), ...out });
  }));

  r.delete('/models/:id/items/:itemId', requireRole('manager'), ...validated({ params: ItemParams }, async (req, res, v) => {
    const bikesRecomputed = await deleteItem(db, currentUser(req).id, v.params.id, v.params.itemId, ctx.now());
    res.json({ ...(await modelDetail(db, v.params.id)), bikesRecomputed });
  }));
  return r;
}
