import { Router } from 'express';
import { sql } from 'drizzle-orm';
import type { AppContext } from '../app';
import { publicRoute } from '../middleware/auth';

export function healthRoutes(ctx: AppContext) {
  const r = Router();
  r.get('/', publicRoute(), async (_req, res) => {
    await ctx.database.db.execute(sql`select 1`);
    res.json({ ok: true, db: ctx.database.kind });
  });
  return r;
}
