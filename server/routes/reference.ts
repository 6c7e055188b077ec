import { Router } from 'express';
import { asc, eq } from 'drizzle-orm';
import type { AppContext } from '../app';
import { currentUser, requireRole, signedIn } from '../middleware/auth';
import { validate } from '../middleware/validate';
import { bikeModels, sites } from '../db/schema';
import { SiteCreateSchema } from '../../shared/schemas/reference';
import { IdParamsSchema } from '../../shared/schemas/common';
import { audit } from '../audit';
import { conflict, notFound } from '../http-error';
import { toModelSummary } from '../services/models';

export function referenceRoutes(ctx: AppContext) {
  const r = Router();
  const db = ctx.database.db;

  r.get('/sites', signedIn(), async (req, res) => {
    const mine = new Set(currentUser(req).siteIds);
    const rows = await db.select().from(sites).orderBy(asc(sites.name));
    res.json({ items: rows.filter((s) => mine.has(s.id)).map(({ id, name, timeZone, bays }) => ({ id, name, timeZone, bays })) });
  });

  r.post('/sites', requireRole('admin'), validate({ body: SiteCreateSchema }), async (req, res) => {
    const body = req.valid.body as { name: string; timeZone: string; bays: number };
    const site = await db.transaction(async (tx) => {
      const [dupe] = await tx.select({ id: sites.id }).from(sites).where(eq(sites.name, body.name));
      if (dupe) throw conflict('A site already has that name.', [{ path: 'name', message: 'Already in use.' }]);
      const [row] = await tx.insert(sites).values(body).returning();
      await audit(tx, { userId: currentUser(req).id, action: 'create', entity: 'site', entityId: row.id, changes: body });
      return row;
    });
    res.status(201).json({ site: { id: site.id, name: site.name, timeZone: site.timeZone, bays: site.bays } });
  });

  r.patch('/sites/:id', requireRole('admin'), validate({ params: IdParamsSchema, body: SiteCreateSchema.partial() }), async (req, res) => {
    const { id } = req.valid.params as { id: string };
    const body = req.valid.body as Partial<{ name: string; timeZone: string; bays: number }>;
    const [row] = await db.update(sites).set(body).where(eq(sites.id, id)).returning();
    if (!row) throw notFound('That site');
    await audit(db, { userId: currentUser(req).id, action: 'update', entity: 'site', entityId: id, changes: body });
    res.json({ site: { id: row.id, name: row.name, timeZone: row.timeZone, bays: row.bays } });
  });

  r.get('/models', signedIn(), async (_req, res) => {
    const rows = await db.select().from(bikeModels).orderBy(asc(bikeModels.name));
    res.json({ items: rows.map(toModelSummary) });
  });
  return r;
}
