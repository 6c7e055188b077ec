import { randomBytes } from 'node:crypto';
import { eq } from 'drizzle-orm';
import type { Db } from './db/client';
import { settings } from './db/schema';

/** The session signing secret: from the environment, else one made once and kept in the database for every instance. */
export async function sessionSecret(db: Db, fromEnv?: string) {
  if (fromEnv) return fromEnv;
  await db
    .insert(settings)
    .values({ key: 'session_secret', value: randomBytes(32).toString('hex') })
    .onConflictDoNothing();
  const [row] = await db.select().from(settings).where(eq(settings.key, 'session_secret'));
  return String(row.value);
}
