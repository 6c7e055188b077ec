import { and, eq } from 'drizzle-orm';
import type { DbOrTx } from '../db/client';
import { userSites, users } from '../db/schema';
import { enqueue } from './outbox';

export const escapeHtml = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

export interface SiteNotice {
  siteId: string;
  subject: string;
  /** Plain text; the HTML part is the same text, escaped, with its line breaks kept. */
  text: string;
  /** Names the event, so the same notice is queued once per manager however often it is asked for. */
  key: string;
}

/** Queues a notice to every active manager of a site, in the caller's transaction: it goes out only if the change it tells of is stored. */
export async function tellSiteManagers(db: DbOrTx, n: SiteNotice, now: Date) {
  const managers = await db
    .select({ id: users.id, email: users.email })
    .from(users)
    .innerJoin(userSites, eq(userSites.userId, users.id))
    .where(and(eq(userSites.siteId, n.siteId), eq(users.role, 'manager'), eq(users.disabled, false)));
  const html = `<p>${escapeHtml(n.text).replace(/\n/g, '<br>')}</p>`;
  for (const m of managers) await enqueue(db, { dedupeKey: `${n.key}:${m.id}`, to: m.email, subject: `Lashline: ${n.subject}`, text: n.text, html }, now);
}
