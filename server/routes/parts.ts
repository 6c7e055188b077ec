import { Router } from 'express';
import { z } from 'zod';
import type { AppContext } from '../app';
import { currentUser, requireRole } from '../middleware/auth';
import { validated } from '../middleware/validate';
import { IdSchema } from '../../shared/schemas/common';
import {
  DraftFromForecastSchema, ForecastQuerySchema, PurchaseOrderCreateSchema, PurchaseOrderListQuerySchema, PurchaseOrderReceiveSchema,
  SiteParamQuerySchema, StockMovementCreateSchema, } from '../../shared/schemas/parts';
import { forecastFor, listParts, recordMovement, setPartMinimum, stockView } from '../services/parts';
import { cancelOrder, createOrder, draftsFromForecast, listOrders, receiveOrder, sendOrder, shortages } from '../services/purchase-orders';

const STOCK_STAFF = ['technician', 'manager', 'admin'] as const;
const OrderParams = z.object({ id: IdSchema });
const MinimumSchema = z.object({
  siteId: IdSchema,
  partId: IdSchema,
  minimum: z.number({ message: 'Type the minimum as a number.' }).finite().min(0, 'A minimum cannot be negative.').max(100_000, 'That minimum is larger than any shelf.'),
});

export function partRoutes(ctx: AppContext) {
  const r = Router();
  const db = ctx.database.db;

  r.get('/parts', requireRole(...STOCK_STAFF), async (_req, res) => {
    res.json({ items: await listParts(db) });
  });

  r.get('/stock', requireRole(...STOCK_STAFF), ...validated({ query: SiteParamQuerySchema }, async (req, res, v) => {
    res.json(await stockView(db, currentUser(req), v.query.site));
  }));

  r.get('/stock/shortages', requireRole(...STOCK_STAFF), async (req, res) => {
    res.json({ items: await shortages(db, currentUser(req), ctx.now(), ctx.readCache) });
  });

  r.post('/stock/movements', requireRole('technician', 'manager'), ...validated({ body: StockMovementCreateSchema }, async (req, res, v) => {
    res.status(201).json(await recordMovement(db, currentUser(req), v.body, ctx.now()));
  }));

  r.put('/stock/minimum', requireRole('manager'), ...validated({ body: MinimumSchema }, async (req, res, v) => {
    const b = v.body;
    res.json(await setPartMinimum(db, currentUser(req), b.siteId, b.partId, b.minimum));
  }));

  r.get('/forecast', requireRole(...STOCK_STAFF), ...validated({ query: ForecastQuerySchema }, async (req, res, v) => {
    const q = v.query;
    res.json(await forecastFor(db, currentUser(req), q.site, q.weeks, ctx.now(), ctx.readCache));
  }));

  r.get('/purchase-orders', requireRole(...STOCK_STAFF), ...validated({ query: PurchaseOrderListQuerySchema }, async (req, res, v) => {
    const q = v.query;
    res.json({ items: await listOrders(db, currentUser(req), q.site, q.status) });
  }));

  r.post('/purchase-orders', requireRole('manager'), ...validated({ body: PurchaseOrderCreateSchema }, async (req, res, v) => {
    res.status(201).json({ order: await createOrder(db, currentUser(req), v.body, ctx.now()) });
  }));

  r.post('/purchase-orders/draft-from-forecast', requireRole('manager'), ...validated({ body: DraftFromForecastSchema }, async (req, res, v) => {
    const b = v.body;
    res.status(201).json({ items: await draftsFromForecast(db, currentUser(req), b.siteId, ctx.now(), ctx.readCache) });
  }));

  r.post('/purchase-orders/:id/send', requireRole('manager'), ...validated({ params: OrderParams }, async (req, res, v) => {
    res.json({ order: await sendOrder(db, currentUser(req), v.params.id, ctx.now()) });
  }));

  r.post('/purchase-orders/:id/cancel', requireRole('manager'), ...validated({ params: OrderParams }, async (req, res, v) => {
    res.json({ order: await cancelOrder(db, currentUser(req), v.params.id) });
  }));

  r.post('/purchase-orders/:id/receive', requireRole('technician', 'manager'), ...validated({ params: OrderParams, body: PurchaseOrderReceiveSchema }, async (req, res, v) => {
    res.json({ order: await receiveOrder(db, currentUser(req), v.params.id, v.body, ctx.now()) });
  }));
  return r;
}
