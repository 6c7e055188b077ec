import { eq, inArray } from 'drizzle-orm';
import type { Db } from '../db/client';
import { sites, userSites, users } from '../db/schema';
import type { SessionUser } from '../../shared/schemas/auth';
import type { User } from '../../shared/schemas/users';

type UserRow = typeof users.$inferSelect;

async function siteIdsOf(db: Db, ids: string[]) {
  const map = new Map<string, string[]>(ids.map((id) => [id, []]));
  if (!ids.length) return map;
  const rows = await db.select().from(userSites).where(inArray(userSites.userId, ids));
  for (const r of rows) map.get(r.userId)?.push(r.siteId);
  return map;
}

// Administrators look after every site, whatever is recorded against them.
async function effectiveSites(db: Db, row: UserRow, recorded: string[]) {
  if (row.role !== 'admin') return recorded;
  return (await db.select({ id: sites.id }).from(sites)).map((s) => s.id);
}

export async function loadSessionUser(db: Db, id: string): Promise<SessionUser | null> {
  const [row] = await db.select().from(users).where(eq(users.id, id));
  if (!row || row.disabled) return null;
  const recorded = (await siteIdsOf(db, [row.id])).get(row.id) ?? [];
  return {
    id: row.id,
    email: row.email,
    name: row.name,
    role: row.role,
    siteIds: await effectiveSites(db, row, recorded),
  };
}

export async function findUserByEmail(db: Db, email: string) {
  const [row] = await db.select().from(users).where(eq(users.email, email.trim().toLowerCase()));
  return row ?? null;
}

export async function listUsers(db: Db): Promise<User[]> {
  const rows = await db.select().from(users).orderBy(users.name);
  const sitesBy = await siteIdsOf(db, rows.map((r) => r.id));
  return rows.map((r) => toUser(r, sitesBy.get(r.id) ?? []));
}

export function toUser(r: UserRow, siteIds: string[]): User {
  return {
    id: r.id,
    email: r.email,
    name: r.name,
    role: r.role,
    disabled: r.disabled,
    siteIds,
    hasPassword: !!r.passwordHash,
  };
}
