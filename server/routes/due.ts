import { Router } from 'express';
import Papa from 'papaparse';
import type { AppContext } from '../app';
import { currentUser, signedIn } from '../middleware/auth';
import { validated } from '../middleware/validate';
import { DueQuerySchema } from '../../shared/schemas/due';
import { listDue } from '../services/due-list';
import { ReadCache } from '../cache/read-cache';
import { todayInZone } from '../../shared/domain/dates';

export const DUE_CSV_COLUMNS = ['fleet_number', 'site', 'model', 'item', 'status', 'due_date', 'trigger', 'remaining_km', 'remaining_days', 'assignee', 'safety_critical'] as const;

export function dueRoutes(ctx: AppContext) {
  const r = Router();
  const db = ctx.database.db;

  r.get('/due', signedIn(), ...validated({ query: DueQuerySchema }, async (req, res, v) => {
    const { siteIds } = currentUser(req);
    const q = v.query;
    const now = ctx.now();
    await ctx.readCache.send(req, res, ReadCache.key('due', siteIds, q, now), async () => ({
      items: await listDue(db, siteIds, q, now),
      today: todayInZone(ctx.config.SCHEDULE_TZ, now),
    }));
  }));

  // RFC 4180: CRLF line ends, fields with commas, quotes or line breaks quoted, quotes doubled.
  r.get('/due.csv', signedIn(), ...validated({ query: DueQuerySchema }, async (req, res, v) => {
    const q = v.query;
    const items = await listDue(db, currentUser(req).siteIds, q, ctx.now());
    const rows = items.map((d) => [
      d.fleetNumber,
      d.siteName,
      d.modelName,
      d.item,
      d.status,
      d.dueDate ?? '',
      d.trigger ?? '',
      d.remainingKm == null ? '' : Math.round(d.remainingKm),
      d.remainingDays ?? '',
      d.assignee?.name ?? '',
      d.safetyCritical ? 'yes' : 'no',
    ]);
    const csv = Papa.unparse({ fields: [...DUE_CSV_COLUMNS], data: rows }, { newline: '\r\n', quotes: false });
    res.setHeader('Content-Type', 'text/csv; charset=utf-8; header=present');
    res.setHeader('Content-Disposition', `attachment; filename="due-within-${q.within}-days.csv"`);
    res.send(`${csv}\r\n`);
  }));
  return r;
}
