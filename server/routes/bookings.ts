import express, { Router, type NextFunction, type Request, type Response } from 'express';
import type { AppContext } from '../app';
import { currentUser, requireRole, signedIn } from '../middleware/auth';
import { validate } from '../middleware/validate';
import { IdParamsSchema } from '../../shared/schemas/common';
import { IMPORT_MAX_BYTES, ImportBodySchema, type ImportBody } from '../../shared/schemas/imports';
import { BookingCreateSchema, BookingListQuerySchema, FeedCreateSchema, type BookingCreate, type BookingListQuery, type FeedCreate } from '../../shared/schemas/bookings';
import { createBooking, deleteBooking, listBookings } from '../services/bookings';
import { previewBookingImport, runBookingImport } from '../services/bookings-import';
import { createFeed, deleteFeed, listFeeds } from '../services/booking-feeds';

// A large file comes as the CSV text itself (Content-Type: text/csv); a small one may come as JSON { csv }.
const csvText = express.text({ type: ['text/csv', 'text/plain'], limit: IMPORT_MAX_BYTES });
const asBody = (req: Request, _res: Response, next: NextFunction) => {
  if (typeof req.body === 'string') req.body = { csv: req.body };
  next();
};
const BOOKERS = ['desk', 'manager', 'admin'] as const;

export function bookingRoutes(ctx: AppContext) {
  const r = Router();
  const db = ctx.database.db;
  const id = (req: Request) => (req.valid.params as { id: string }).id;

  r.get('/bookings', signedIn(), validate({ query: BookingListQuerySchema }), async (req, res) => {
    res.json(await listBookings(db, currentUser(req), req.valid.query as BookingListQuery, ctx.now()));
  });

  r.post('/bookings', requireRole(...BOOKERS), validate({ body: BookingCreateSchema }), async (req, res) => {
    res.status(201).json(await createBooking(db, currentUser(req), req.valid.body as BookingCreate, ctx.now()));
  });

  const csv = [csvText, asBody, validate({ body: ImportBodySchema })];
  r.post('/bookings/import/preview', requireRole(...BOOKERS), ...csv, async (req, res) => {
    res.json(await previewBookingImport(db, currentUser(req), (req.valid.body as ImportBody).csv));
  });

  r.post('/bookings/import', requireRole(...BOOKERS), ...csv, async (req, res) => {
    res.status(201).json(await runBookingImport(db, currentUser(req), (req.valid.body as ImportBody).csv, ctx.now()));
  });

  r.delete('/bookings/:id', requireRole(...BOOKERS), validate({ params: IdParamsSchema }), async (req, res) => {
    res.json(await deleteBooking(db, currentUser(req), id(req), ctx.now()));
  });

  r.get('/booking-feeds', requireRole('manager', 'admin'), async (req, res) => {
    res.json({ items: await listFeeds(db, currentUser(req), ctx.now()) });
  });

  r.post('/booking-feeds', requireRole('manager', 'admin'), validate({ body: FeedCreateSchema }), async (req, res) => {
    res.status(201).json(await createFeed(db, currentUser(req), req.valid.body as FeedCreate, ctx.now()));
  });

  r.delete('/booking-feeds/:id', requireRole('manager', 'admin'), validate({ params: IdParamsSchema }), async (req, res) => {
    res.json(await deleteFeed(db, currentUser(req), id(req), ctx.now()));
  });
  return r;
}
