import express, { Router, type NextFunction, type Request, type Response } from 'express';
import type { AppContext } from '../app';
import { currentUser, requireRole } from '../middleware/auth';
import { validated } from '../middleware/validate';
import { IMPORT_MAX_BYTES, ImportBodySchema, ImportParamsSchema } from '../../shared/schemas/imports';
import { previewImport, runImport } from '../services/imports';

// The API reads JSON bodies up to 1 MB before any router sees them, so a larger file comes as the
// CSV text itself (Content-Type: text/csv, up to 5 MB); a small one may also come as JSON { csv }.
const csvText = express.text({ type: ['text/csv', 'text/plain'], limit: IMPORT_MAX_BYTES });
const asBody = (req: Request, _res: Response, next: NextFunction) => {
  if (typeof req.body === 'string') req.body = { csv: req.body };
  next();
};

export function importRoutes(ctx: AppContext) {
  const r = Router();
  const db = ctx.database.db;
  const input = [csvText, asBody];
  const shapes = { params: ImportParamsSchema, body: ImportBodySchema };

  r.post('/import/:kind/preview', requireRole('manager', 'admin'), ...input, ...validated(shapes, async (req, res, { params, body }) => {
    res.json(await previewImport(db, currentUser(req), params.kind, body.csv, ctx.now()));
  }));

  r.post('/import/:kind', requireRole('manager', 'admin'), ...input, ...validated(shapes, async (req, res, { params, body }) => {
    res.json(await runImport(db, currentUser(req), params.kind, body.csv, ctx.now()));
  }));
  return r;
}
