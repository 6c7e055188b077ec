import { Router } from 'express';
import { z } from 'zod';
import type { AppContext } from '../app';
import { currentUser, requireRole } from '../middleware/auth';
import { validate } from '../middleware/validate';
import { IdSchema } from '../../shared/schemas/common';
import {
  DraftFromForecastSchema, ForecastQuerySchema, PurchaseOrderCreateSchema, PurchaseOrderListQuerySchema, PurchaseOrderReceiveSchema,
  SiteParamQuerySchema, StockMovementCreateSchema, type ForecastQuery, type PurchaseOrderCreate, type PurchaseOrderReceive, type StockMovementCreate,
} from '../../shared/schemas/parts';
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

  r.get('/stock', requireRole(...STOCK_STAFF), validate({ query: SiteParamQuerySchema }), async (req, res) => {
    res.json(await stockView(db, currentUser(req), (req.valid.query as { site: string }).site));
  });

  r.get('/stock/shortages', requireRole(...STOCK_STAFF), async (req, res) => {
    res.json({ items: await shortages(db, currentUser(req), ctx.now(), ctx.readCache) });
  });

  r.post('/stock/movements', requireRole('technician', 'manager'), validate({ body: StockMovementCreateSchema }), async (req, res) => {
    res.status(201).json(await recordMovement(db, currentUser(req), req.valid.body as StockMovementCreate, ctx.now()));
  });

  r.put('/stock/minimum', requireRole('manager'), validate({ body: MinimumSchema }), async (req, res) => {
    const b = req.valid.body as z.infer<typeof MinimumSchema>;
    res.json(await setPartMinimum(db, currentUser(req), b.siteId, b.partId, b.minimum));
  });

  r.get('/forecast', requireRole(...STOCK_STAFF), validate({ query: ForecastQuerySchema }), async (req, res) => {
    const q = req.valid.query as ForecastQuery;
    res.json(await forecastFor(db, currentUser(req), q.site, q.weeks, ctx.now(), ctx.readCache));
  });

  r.get('/purchase-orders', requireRole(...STOCK_STAFF), validate({ query: PurchaseOrderListQuerySchema }), async (req, res) => {
    const q = req.valid.query as z.infer<typeof PurchaseOrderListQuerySchema>;
    res.json({ items: await listOrders(db, currentUser(req), q.site, q.status) });
  });

  r.post('/purchase-orders', requireRole('manager'), validate({ body: PurchaseOrderCreateSchema }), async (req, res) => {
    res.status(201).json({ order: await createOrder(db, currentUser(req), req.valid.body as PurchaseOrderCreate, ctx.now()) });
  });

  r.post('/purchase-orders/draft-from-forecast', requireRole('manager'), validate({ body: DraftFromForecastSchema }), async (req, res) => {
    const b = req.valid.body as z.infer<typeof DraftFromForecastSchema>;
    res.status(201).json({ items: await draftsFromForecast(db, currentUser(req), b.siteId, ctx.now(), ctx.readCache) });
  });

  r.post('/purchase-orders/:id/send', requireRole('manager'), validate({ params: OrderParams }), async (req, res) => {
    res.json({ order: await sendOrder(db, currentUser(req), (req.valid.params as { id: string }).id, ctx.now()) });
  });

  r.post('/purchase-orders/:id/cancel', requireRole('manager'), validate({ params: OrderParams }), async (req, res) => {
    res.json({ order: await cancelOrder(db, currentUser(req), (req.valid.params as { id: string }).id) });
  });

  r.post('/purchase-orders/:id/receive', requireRole('technician', 'manager'), validate({ params: OrderParams, body: PurchaseOrderReceiveSchema }), async (req, res) => {
    res.json({ order: await receiveOrder(db, currentUser(req), (req.valid.params as { id: string }).id, req.valid.body as PurchaseOrderReceive, ctx.now()) });
  });
  return r;
}
