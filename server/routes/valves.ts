import { Router, type Request } from 'express';
import { z } from 'zod';
import { ReadCache } from '../cache/read-cache';
import type { AppContext } from '../app';
import { currentUser, requireRole, signedIn } from '../middleware/auth';
import { validated } from '../middleware/validate';
import { IdParamsSchema, IdSchema } from '../../shared/schemas/common';
import { StockAdjustSchema, StockMinSchema } from '../../shared/schemas/valves';
import { canSeeSite } from '../../shared/domain/policies';
import { forbidden, notFound } from '../http-error';
import { getBike } from '../services/bikes';
import { trendsForBikes } from '../services/valve-history';
import { fleetRollup } from '../services/valve-rollup';
import { valveWarningsFor } from '../services/valve-warnings';
import { moveStock, setMinimum, stockAt } from '../services/shim-stock';
import { reorderList } from '../services/reorder';
import { audit } from '../audit';

const SiteQuery = z.object({ siteId: IdSchema });

export function valveRoutes(ctx: AppContext) {
  const r = Router();
  const db = ctx.database.db;
  const mySite = (req: Request, siteId: string) => {
    if (!canSeeSite(currentUser(req), siteId)) throw forbidden('That site is not one of yours.');
  };

  r.get('/bikes/:id/valves', signedIn(), ...validated({ params: IdParamsSchema }, async (req, res, v) => {
    const { id } = v.params;
    const bike = await getBike(db, currentUser(req).siteIds, id);
    if (!bike) throw notFound('That bike');
    const [t] = await trendsForBikes(db, { bikeIds: [id] });
    res.json({ valves: t?.valves ?? [], adjuster: t?.adjuster ?? '' });
  }));

  r.get('/valves/rollup', requireRole('manager', 'admin', 'technician'), async (req, res) => {
    const { siteIds } = currentUser(req);
    await ctx.readCache.send(req, res, ReadCache.key('valve-rollup', siteIds, null, ctx.now()), async () => ({ items: await fleetRollup(db, siteIds) }), 'valves');
  });

  r.get('/valves/warnings', requireRole('manager', 'admin', 'technician'), async (req, res) => {
    const { siteIds } = currentUser(req);
    await ctx.readCache.send(req, res, ReadCache.key('valve-warnings', siteIds, null, ctx.now()), async () => ({ items: await valveWarningsFor(db, siteIds) }), 'valves');
  });

  r.get('/stock/shims', requireRole('technician', 'manager', 'admin'), ...validated({ query: SiteQuery }, async (req, res, v) => {
    const { siteId } = v.query;
    mySite(req, siteId);
    res.json({ items: await stockAt(db, siteId) });
  }));

  r.get('/stock/shims/reorder', requireRole('technician', 'manager', 'admin'), ...validated({ query: SiteQuery }, async (req, res, v) => {
    const { siteId } = v.query;
    mySite(req, siteId);
    res.json({ items: await reorderList(db, siteId) });
  }));

  r.post('/stock/shims/adjust', requireRole('technician', 'manager'), ...validated({ body: StockAdjustSchema }, async (req, res, v) => {
    const b = v.body;
    mySite(req, b.siteId);
    const user = currentUser(req);
    await db.transaction(async (tx) => {
      await moveStock(tx, { ...b, by: user.id, at: ctx.now() });
      await audit(tx, { userId: user.id, action: 'stock-adjust', entity: 'shim-stock', entityId: b.siteId, changes: b });
    });
    res.json({ items: await stockAt(db, b.siteId) });
  }));

  r.put('/stock/shims/minimum', requireRole('manager'), ...validated({ body: StockMinSchema }, async (req, res, v) => {
    const b = v.body;
    mySite(req, b.siteId);
    await setMinimum(db, b.siteId, b.sizeMm, b.minCount);
    await audit(db, { userId: currentUser(req).id, action: 'stock-minimum', entity: 'shim-stock', entityId: b.siteId, changes: b });
    res.json({ items: await stockAt(db, b.siteId) });
  }));
  return r;
}
