import { createHash, randomBytes } from 'node:crypto';
import { and, count, eq, gt } from 'drizzle-orm';
import type { Db } from '../db/client';
import { sites, userSites, users } from '../db/schema';
import { HttpError, badRequest, conflict, notFound } from '../http-error';
import { hashPassword, passwordProblem } from '../auth/passwords';
import { audit, diff } from '../audit';
import { loadSessionUser, toUser } from './users';
import type { Setup, SessionUser } from '../../shared/schemas/auth';
import type { Invite, UserUpdate } from '../../shared/schemas/users';

const INVITE_DAYS = 7;
export const tokenHash = (t: string) => createHash('sha256').update(t).digest('hex');

export async function needsSetup(db: Db) {
  const [row] = await db.select({ n: count() }).from(users);
  return (row?.n ?? 0) === 0;
}

function refuseWeak(password: string, context: string[]) {
  const problem = passwordProblem(password, context);
  if (problem) throw badRequest(problem, [{ path: 'password', message: problem }]);
}

/** The first start on an empty database: one site and its administrator. */
export async function runFirstSetup(db: Db, s: Setup): Promise<SessionUser> {
  refuseWeak(s.password, [s.email.split('@')[0], s.name]);
  const passwordHash = await hashPassword(s.password);
  const id = await db.transaction(async (tx) => {
    const [{ n }] = await tx.select({ n: count() }).from(users);
    if (n > 0) throw conflict('Lashline is already set up. Sign in, or ask your administrator for an invitation.');
    const [site] = await tx.insert(sites).values({ name: s.siteName, timeZone: s.timeZone }).returning();
    const [user] = await tx
      .insert(users)
      .values({ email: s.email, name: s.name, role: 'admin', passwordHash })
      .returning();
    await tx.insert(userSites).values({ userId: user.id, siteId: site.id });
    await audit(tx, { userId: user.id, action: 'setup', entity: 'user', entityId: user.id });
    return user.id;
  });
  return (await loadSessionUser(db, id))!;
}

async function checkSites(db: Db, siteIds: string[]) {
  const known = new Set((await db.select({ id: sites.id }).from(sites)).map((s) => s.id));
  const unknown = siteIds.filter((id) => !known.has(id));
  if (unknown.length) throw badRequest('Choose sites that exist.', [{ path: 'siteIds', message: 'Unknown site.' }]);
}

export async function inviteUser(db: Db, by: string, inv: Invite, now: Date) {
  await checkSites(db, inv.siteIds);
  const token = randomBytes(24).toString('base64url');
  const expires = new Date(now.getTime() + INVITE_DAYS * 86_400_000);
  const row = await db.transaction(async (tx) => {
    const [existing] = await tx.select({ id: users.id }).from(users).where(eq(users.email, inv.email));
    if (existing)
      throw conflict('Someone already has that e-mail address.', [{ path: 'email', message: 'Already in use.' }]);
    const [u] = await tx
      .insert(users)
      .values({ email: inv.email, name: inv.name, role: inv.role, inviteTokenHash: tokenHash(token), inviteExpiresAt: expires })
      .returning();
    await tx.insert(userSites).values(inv.siteIds.map((siteId) => ({ userId: u.id, siteId })));
    await audit(tx, { userId: by, action: 'invite', entity: 'user', entityId: u.id, changes: { role: inv.role, siteIds: inv.siteIds } });
    return u;
  });
  return { user: toUser(row, inv.siteIds), invitePath: `/invite/${token}` };
}

export async function acceptInvite(db: Db, token: string, password: string, now: Date) {
  const [row] = await db
    .select()
    .from(users)
    .where(and(eq(users.inviteTokenHash, tokenHash(token)), gt(users.inviteExpiresAt, now)));
  if (!row || row.disabled)
    throw new HttpError(400, 'validation_failed', 'This invitation is not valid any more. Ask your administrator for a new one.');
  refuseWeak(password, [row.email.split('@')[0], row.name]);
  await db
    .update(users)
    .set({ passwordHash: await hashPassword(password), inviteTokenHash: null, inviteExpiresAt: null })
    .where(eq(users.id, row.id));
  return (await loadSessionUser(db, row.id))!;
}

export async function updateUser(db: Db, by: string, id: string, u: UserUpdate) {
  if (u.siteIds) await checkSites(db, u.siteIds);
  return db.transaction(async (tx) => {
    const [before] = await tx.select().from(users).where(eq(users.id, id));
    if (!before) throw notFound('That person');
    if (id === by && (u.disabled || (u.role && u.role !== 'admin')))
      throw conflict('You cannot disable yourself or drop your own administrator role. Ask another administrator.');
    const { siteIds, ...fields } = u;
    const [after] = Object.keys(fields).length
      ? await tx.update(users).set(fields).where(eq(users.id, id)).returning()
      : [before];
    if (siteIds) {
      await tx.delete(userSites).where(eq(userSites.userId, id));
      await tx.insert(userSites).values(siteIds.map((siteId) => ({ userId: id, siteId })));
    }
    await audit(tx, { userId: by, action: 'update', entity: 'user', entityId: id, changes: { ...diff(before, fields), ...(siteIds ? { siteIds } : {}) } });
    const current = siteIds ?? (await tx.select().from(userSites).where(eq(userSites.userId, id))).map((r) => r.siteId);
    return { user: toUser(after, current), endSessions: !!u.disabled || (!!u.role && u.role !== before.role) };
  });
}
