import { Router } from 'express';
import type { AppContext } from '../app';
import { currentUser, signedIn } from '../middleware/auth';
import { validated } from '../middleware/validate';
import { IdParamsSchema } from '../../shared/schemas/common';
import { notFound } from '../http-error';
import { serviceRecordOf } from '../services/service-history';
import { historyCsv } from '../services/history-csv';

const fileSafe = (s: string) => s.replace(/[^A-Za-z0-9._-]+/g, '_');

export function recordRoutes(ctx: AppContext) {
  const r = Router();
  const db = ctx.database.db;

  const recordOf = async (siteIds: string[], id: string) => {
    const record = await serviceRecordOf(db, siteIds, id, ctx.now());
    if (!record) throw notFound('That bike');
    return record;
  };

  r.get('/bikes/:id/service-record', signedIn(), ...validated({ params: IdParamsSchema }, async (req, res, v) => {
    const { id } = v.params;
    res.json(await recordOf(currentUser(req).siteIds, id));
  }));

  r.get('/bikes/:id/history.csv', signedIn(), ...validated({ params: IdParamsSchema }, async (req, res, v) => {
    const { id } = v.params;
    const record = await recordOf(currentUser(req).siteIds, id);
    res.setHeader('Content-Type', 'text/csv; charset=utf-8; header=present');
    res.setHeader('Content-Disposition', `attachment; filename="${fileSafe(record.bike.fleetNumber)}-history.csv"`);
    res.send(await historyCsv(db, record));
  }));
  return r;
}
