import { Router } from 'express';
import type { AppContext } from '../app';
import { currentUser, requireRole } from '../middleware/auth';
import { validated } from '../middleware/validate';
import { IdParamsSchema } from '../../shared/schemas/common';
import { InviteSchema, UserUpdateSchema } from '../../shared/schemas/users';
import { inviteUser, updateUser } from '../services/accounts';
import { listUsers } from '../services/users';

export function adminUserRoutes(ctx: AppContext) {
  const r = Router();
  const db = ctx.database.db;

  r.get('/', requireRole('admin'), async (_req, res) => {
    res.json({ items: await listUsers(db) });
  });

  r.post('/', requireRole('admin'), ...validated({ body: InviteSchema }, async (req, res, v) => {
    res.status(201).json(await inviteUser(db, currentUser(req).id, v.body, ctx.now()));
  }));

  r.patch('/:id', requireRole('admin'), ...validated({ params: IdParamsSchema, body: UserUpdateSchema }, async (req, res, v) => {
    const { id } = v.params;
    const { user, endSessions } = await updateUser(db, currentUser(req).id, id, v.body);
    // A disabled account or a changed role ends that person's sessions at once, on every device.
    if (endSessions) await ctx.sessions.destroyForUser(id);
    res.json({ user });
  }));
  return r;
}
