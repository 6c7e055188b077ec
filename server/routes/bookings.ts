import express, { Router, type NextFunction, type Request, type Response } from 'express';
import type { AppContext } from '../app';
import { currentUser, requireRole, signedIn } from '../middleware/auth';
import { validated } from '../middleware/validate';
import { IdParamsSchema } from '../../shared/schemas/common';
import { IMPORT_MAX_BYTES, ImportBodySchema } from '../../shared/schemas/imports';
import { BookingCreateSchema, BookingListQuerySchema, FeedCreateSchema } from '../../shared/schemas/bookings';
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

  r.get('/bookings', signedIn(), ...validated({ query: BookingListQuerySchema }, async (req, res, v) => {
    res.json(await listBookings(db, currentUser(req), v.query, ctx.now()));
  }));

  r.post('/bookings', requireRole(...BOOKERS), ...validated({ body: BookingCreateSchema }, async (req, res, v) => {
    res.status(201).json(await createBooking(db, currentUser(req), v.body, ctx.now()));
  }));

  const csv = [csvText, asBody];
  r.post('/bookings/import/preview', requireRole(...BOOKERS), ...csv, ...validated({ body: ImportBodySchema }, async (req, res, v) => {
    res.json(await previewBookingImport(db, currentUser(req), v.body.csv));
  }));

  r.post('/bookings/import', requireRole(...BOOKERS), ...csv, ...validated({ body: ImportBodySchema }, async (req, res, v) => {
    res.status(201).json(await runBookingImport(db, currentUser(req), v.body.csv, ctx.now()));
  }));

  r.delete('/bookings/:id', requireRole(...BOOKERS), ...validated({ params: IdParamsSchema }, async (req, res, v) => {
    res.json(await deleteBooking(db, currentUser(req), v.params.id, ctx.now()));
  }));

  r.get('/booking-feeds', requireRole('manager', 'admin'), async (req, res) => {
    res.json({ items: await listFeeds(db, currentUser(req), ctx.now()) });
  });

  r.post('/booking-feeds', requireRole('manager', 'admin'), ...validated({ body: FeedCreateSchema }, async (req, res, v) => {
    res.status(201).json(await createFeed(db, currentUser(req), v.body, ctx.now()));
  }));

  r.delete('/booking-feeds/:id', requireRole('manager', 'admin'), ...validated({ params: IdParamsSchema }, async (req, res, v) => {
    res.json(await deleteFeed(db, currentUser(req), v.params.id, ctx.now()));
  }));
  return r;
}
