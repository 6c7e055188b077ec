import { Router } from 'express';
import { eq } from 'drizzle-orm';
import { z } from 'zod';
import type { AppContext } from '../app';
import { currentUser, requireRole, signedIn } from '../middleware/auth';
import { validated } from '../middleware/validate';
import { settings } from '../db/schema';
import { DEFAULT_LIMITS } from '../../shared/domain/limits';
import { audit } from '../audit';

export const SettingsSchema = z.object({
  tyreTreadMinMm: z.number().min(0.5, 'Use at least 0.5 mm.').max(5, 'Use at most 5 mm.'),
});
export type Settings = z.infer<typeof SettingsSchema>;

const SOURCE =
  'Default 1.0 mm: Great Britain requires at least 1 mm across three-quarters of the tread width, all the way round, for motorcycles over 50 cc (Road Vehicles (Construction and Use) Regulations 1986, reg. 27(1)(g)(ii)). Local law decides: set the limit that applies where your bikes are ridden.';

export async function readSettings(db: AppContext['database']['db']): Promise<Settings> {
  const [row] = await db.select().from(settings).where(eq(settings.key, 'tyre_tread_min_mm'));
  return { tyreTreadMinMm: row ? Number(row.value) : DEFAULT_LIMITS.tyreTreadMinMm };
}

export function settingsRoutes(ctx: AppContext) {
  const r = Router();
  const db = ctx.database.db;
  r.get('/settings', signedIn(), async (_req, res) => {
    res.json({ settings: await readSettings(db), sources: { tyreTreadMinMm: SOURCE } });
  });
  r.put('/admin/settings', requireRole('admin'), ...validated({ body: SettingsSchema }, async (req, res, v) => {
    const body = v.body;
    await db.transaction(async (tx) => {
      await tx.insert(settings).values({ key: 'tyre_tread_min_mm', value: body.tyreTreadMinMm }).onConflictDoUpdate({ target: settings.key, set: { value: body.tyreTreadMinMm, updatedAt: ctx.now() } });
      await audit(tx, { userId: currentUser(req).id, action: 'update', entity: 'settings', changes: body });
    });
    res.json({ settings: await readSettings(db), sources: { tyreTreadMinMm: SOURCE } });
  }));
  return r;
}
