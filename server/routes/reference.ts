import { Router } from 'express';
import { asc, eq } from 'drizzle-orm';
import type { AppContext } from '../app';
import { currentUser, requireRole, signedIn } from '../middleware/auth';
import { validated } from '../middleware/validate';
import { bikeModels, sites } from '../db/schema';
import { SiteCreateSchema } from '../../shared/schemas/reference';
import { IdParamsSchema } from '../../shared/schemas/common';
import { audit } from '../audit';
import { conflict, notFound } from '../http-error';
import { toModelSummary } from '../services/models';
import { addBays, bayCount, trimBays } from '../services/capacity';
import { replanAfter } from '../services/replan';

export function referenceRoutes(ctx: AppContext) {
  const r = Router();
  const db = ctx.database.db;

  r.get('/sites', signedIn(), async (req, res) => {
    const mine = new Set(currentUser(req).siteIds);
    const rows = await db.select().from(sites).orderBy(asc(sites.name));
    res.json({ items: rows.filter((s) => mine.has(s.id)).map(({ id, name, timeZone, bays }) => ({ id, name, timeZone, bays })) });
  });

  r.post('/sites', requireRole('admin'), ...validated({ body: SiteCreateSchema }, async (req, res, v) => {
    const body = v.body;
    const site = await db.transaction(async (tx) => {
      const [dupe] = await tx.select({ id: sites.id }).from(sites).where(eq(sites.name, body.name));
      if (dupe) throw conflict('A site already has that name.', [{ path: 'name', message: 'Already in use.' }]);
      const [row] = await tx.insert(sites).values({ ...body, bays: 0 }).returning();
      await addBays(tx, row.id, body.bays);
      row.bays = body.bays;
      await audit(tx, { userId: currentUser(req).id, action: 'create', entity: 'site', entityId: row.id, changes: body });
      return row;
    });
    res.status(201).json({ site: { id: site.id, name: site.name, timeZone: site.timeZone, bays: site.bays } });
  }));

  r.patch('/sites/:id', requireRole('admin'), ...validated({ params: IdParamsSchema, body: SiteCreateSchema.partial() }, async (req, res, v) => {
    const { id } = v.params;
    const body = v.body;
    const user = currentUser(req);
    const row = await db.transaction(async (tx) => {
      const [exists] = await tx.select().from(sites).where(eq(sites.id, id)).for('update');
      if (!exists) throw notFound('That site');
      if (body.name !== undefined && body.name !== exists.name) {
        const [dupe] = await tx.select({ id: sites.id }).from(sites).where(eq(sites.name, body.name));
        if (dupe) throw conflict('A site already has that name.', [{ path: 'name', message: 'Already in use.' }]);
      }
      const { bays: count, ...rest } = body;
      if (Object.keys(rest).length) await tx.update(sites).set(rest).where(eq(sites.id, id));
      // The bay count follows the bay rows: new bays at the end, or the last ones removed (refused while planned).
      const have = count === undefined ? 0 : await bayCount(tx, id);
      if (count !== undefined && count > have) await addBays(tx, id, count - have);
      if (count !== undefined && count <= have) await trimBays(tx, id, body.timeZone ?? exists.timeZone, count, ctx.now());
      await audit(tx, { userId: user.id, action: 'update', entity: 'site', entityId: id, changes: body });
      const [after] = await tx.select().from(sites).where(eq(sites.id, id));
      return after;
    });
    if (body.bays !== undefined || body.timeZone !== undefined) await replanAfter(db, { siteIds: [id], why: 'site changed' }, ctx.now());
    res.json({ site: { id: row.id, name: row.name, timeZone: row.timeZone, bays: row.bays } });
  }));

  r.get('/models', signedIn(), async (_req, res) => {
    const rows = await db.select().from(bikeModels).orderBy(asc(bikeModels.name));
    res.json({ items: rows.map(toModelSummary) });
  });
  return r;
}
