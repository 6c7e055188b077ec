import { Router } from 'express';
import { eq } from 'drizzle-orm';
import type { AppContext } from '../app';
import { currentUser, requireRole, signedIn } from '../middleware/auth';
import { validate } from '../middleware/validate';
import { IdParamsSchema } from '../../shared/schemas/common';
import {
  MyDayQuerySchema,
  PlanQuerySchema,
  PlanRunSchema,
  PlanSettingsSchema,
  VisitMoveSchema,
  type PlanQuery,
  type PlanSettings,
  type VisitMove,
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

  r.get('/', requireRole('manager', 'admin', 'technician'), validate({ query: PlanQuerySchema }), async (req, res) => {
    res.json(await planAnswer(db, currentUser(req), req.valid.query as PlanQuery, ctx.now()));
  });

  r.post('/run', requireRole('manager', 'admin'), validate({ body: PlanRunSchema }), async (req, res) => {
    const user = currentUser(req);
    const { site } = req.valid.body as { site?: string };
    if (site && !canSeeSite(user, site)) throw notFound('That site');
    const report = await runPlan(db, { siteIds: site ? [site] : user.siteIds, why: 're-plan asked for by a manager', now: ctx.now() });
    await audit(db, { userId: user.id, action: 'plan', entity: 'plan', entityId: site ?? null, changes: report });
    res.json({ ...(await planAnswer(db, user, { site }, ctx.now())), report });
  });

  r.patch('/visits/:id', requireRole('manager', 'admin'), validate({ params: IdParamsSchema, body: VisitMoveSchema }), async (req, res) => {
    const { id } = req.valid.params as { id: string };
    res.json({ visit: await moveVisit(db, currentUser(req), id, req.valid.body as VisitMove, ctx.now()) });
  });

  r.get('/my-day', requireRole('technician', 'manager'), validate({ query: MyDayQuerySchema }), async (req, res) => {
    res.json(await myDay(db, currentUser(req), (req.valid.query as { date?: string }).date, ctx.now()));
  });

  r.get('/next-visits', signedIn(), validate({ query: PlanQuerySchema }), async (req, res) => {
    res.json({ items: await nextVisits(db, currentUser(req), (req.valid.query as PlanQuery).site, ctx.now()) });
  });

  r.get('/settings', requireRole('manager', 'admin'), async (_req, res) => {
    res.json({ settings: await readPlanSettings(db) });
  });

  r.put('/settings', requireRole('manager', 'admin'), validate({ body: PlanSettingsSchema }), async (req, res) => {
    const body = req.valid.body as PlanSettings;
    await db.transaction(async (tx) => {
      await tx.insert(settings).values({ key: PLAN_SETTINGS_KEY, value: body }).onConflictDoUpdate({ target: settings.key, set: { value: body, updatedAt: ctx.now() } });
      await audit(tx, { userId: currentUser(req).id, action: 'update', entity: 'plan-settings', changes: body });
    });
    await runPlan(db, { siteIds: currentUser(req).siteIds, why: 'planning settings changed', now: ctx.now() });
    res.json({ settings: await readPlanSettings(db) });
  });
  return r;
}
