import { Router } from 'express';
import type { AppContext } from '../app';
import { currentUser, requireRole } from '../middleware/auth';
import { validate } from '../middleware/validate';
import { IdParamsSchema } from '../../shared/schemas/common';
import { InviteSchema, UserUpdateSchema, type Invite, type UserUpdate } from '../../shared/schemas/users';
import { inviteUser, updateUser } from '../services/accounts';
import { listUsers } from '../services/users';

export function adminUserRoutes(ctx: AppContext) {
  const r = Router();
  const db = ctx.database.db;

  r.get('/', requireRole('admin'), async (_req, res) => {
    res.json({ items: await listUsers(db) });
  });

  r.post('/', requireRole('admin'), validate({ body: InviteSchema }), async (req, res) => {
    res.status(201).json(await inviteUser(db, currentUser(req).id, req.valid.body as Invite, ctx.now()));
  });

  r.patch('/:id', requireRole('admin'), validate({ params: IdParamsSchema, body: UserUpdateSchema }), async (req, res) => {
    const { id } = req.valid.params as { id: string };
    const { user, endSessions } = await updateUser(db, currentUser(req).id, id, req.valid.body as UserUpdate);
    // A disabled account or a changed role ends that person's sessions at once, on every device.
    if (endSessions) await ctx.sessions.destroyForUser(id);
    res.json({ user });
  });
  return r;
}
