import { Router } from 'express';
import type { AppContext } from '../app';
import { currentUser, requireRole, signedIn } from '../middleware/auth';
import { validated } from '../middleware/validate';
import { IdParamsSchema } from '../../shared/schemas/common';
import {
  MyDayQuerySchema,
  PlanQuerySchema,
  PlanRunSchema,
  PlanSettingsSchema,
  VisitMoveSchema,
  } from '../../shared/schemas/plan';
import { canSeeSite } from '../../shared/domain/policies';
import { notFound } from '../http-error';
import { settings } from '../db/schema';
import { audit } from '../audit';
import { moveVisit, myDay, nextVisits, planAnswer, runPlan } from '../services/workshop-plan';
import { PLAN_SETTINGS_KEY, readPlanSettings } from '../services/workshop-plan-inputs';

export function workshopPlanRoutes(ctx: AppContext) {
  const r = Router();
  const db = ctx.database.db;

  r.get('/', requireRole('manager', 'admin', 'technician'), ...validated({ query: PlanQuerySchema }, async (req, res, v) => {
    res.json(await planAnswer(db, currentUser(req), v.query, ctx.now()));
  }));

  r.post('/run', requireRole('manager', 'admin'), ...validated({ body: PlanRunSchema }, async (req, res, v) => {
    const user = currentUser(req);
    const { site } = v.body;
    if (site && !canSeeSite(user, site)) throw notFound('That site');
    const report = await runPlan(db, { siteIds: site ? [site] : user.siteIds, why: 're-plan asked for by a manager', now: ctx.now() });
    await audit(db, { userId: user.id, action: 'plan', entity: 'plan', entityId: site ?? null, changes: report });
    res.json({ ...(await planAnswer(db, user, { site }, ctx.now())), report });
  }));

  r.patch('/visits/:id', requireRole('manager', 'admin'), ...validated({ params: IdParamsSchema, body: VisitMoveSchema }, async (req, res, v) => {
    const { id } = v.params;
    res.json({ visit: await moveVisit(db, currentUser(req), id, v.body, ctx.now()) });
  }));

  r.get('/my-day', requireRole('technician', 'manager'), ...validated({ query: MyDayQuerySchema }, async (req, res, v) => {
    res.json(await myDay(db, currentUser(req), v.query.date, ctx.now()));
  }));

  r.get('/next-visits', signedIn(), ...validated({ query: PlanQuerySchema }, async (req, res, v) => {
    res.json({ items: await nextVisits(db, currentUser(req), v.query.site, ctx.now()) });
  }));

  r.get('/settings', requireRole('manager', 'admin'), async (_req, res) => {
    res.json({ settings: await readPlanSettings(db) });
  });

  r.put('/settings', requireRole('manager', 'admin'), ...validated({ body: PlanSettingsSchema }, async (req, res, v) => {
    const body = v.body;
    await db.transaction(async (tx) => {
      await tx.insert(settings).values({ key: PLAN_SETTINGS_KEY, value: body }).onConflictDoUpdate({ target: settings.key, set: { value: body, updatedAt: ctx.now() } });
      await audit(tx, { userId: currentUser(req).id, action: 'update', entity: 'plan-settings', changes: body });
    });
    await runPlan(db, { siteIds: currentUser(req).siteIds, why: 'planning settings changed', now: ctx.now() });
    res.json({ settings: await readPlanSettings(db) });
  }));
  return r;
}
