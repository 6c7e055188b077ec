import { demoReadingTemplates } from './reading-templates';
import { count } from 'drizzle-orm';
import type { PgTable } from 'drizzle-orm/pg-core';
import { TZDate } from '@date-fns/tz';
import { format } from 'date-fns';
import type { Db } from '../db/client';
import {
  bikeModels, bikes, defects, readingTemplates, odometerReadings, serviceItems, serviceRecords, shimStock, sites, userSites, users,
  valveChecks, valveReadings,
} from '../db/schema';
import { hashPassword } from '../auth/passwords';
import { buildScenario } from './scenario';
import { seedCapacity } from './capacity-demo';
import { seedBookings } from './bookings-demo';
import { seedParts } from './parts-demo';

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

/** Multi-row inserts keep the load to a few dozen statements; 500 rows stay far below the bind-parameter limit. */
const BATCH = 500;

async function insertAll<T extends PgTable>(tx: Tx, table: T, rows: T['$inferInsert'][]) {
  for (let i = 0; i < rows.length; i += BATCH) await tx.insert(table).values(rows.slice(i, i + BATCH));
}

export const londonToday = (now = new Date()) => format(new TZDate(now, 'Europe/London'), 'yyyy-MM-dd');

/**
 * Loads the invented Saltmarsh fleet into an empty database in one transaction
 * and says what it loaded. Every account gets the same password; it is hashed
 * once because argon2id is slow on purpose.
 */
export async function seedDemo(db: Db, opts: { password: string; today?: string }): Promise<string> {
  const s = buildScenario(opts.today ?? londonToday());
  const passwordHash = await hashPassword(opts.password);
  await db.transaction(async (tx) => {
    for (const table of [users, sites, bikes] as const) {
      const [{ n }] = await tx.select({ n: count() }).from(table);
      if (n > 0) throw new Error('The demo scenario loads into an empty database only, and this one already has data.');
    }
    await insertAll(tx, sites, s.sites);
    await insertAll(tx, users, s.users.map((u) => ({ ...u, passwordHash })));
    await insertAll(tx, userSites, s.userSites);
    await insertAll(tx, bikeModels, s.models);
    await insertAll(tx, serviceItems, s.serviceItems);
    await insertAll(tx, readingTemplates, demoReadingTemplates(s.serviceItems));
    await insertAll(tx, bikes, s.bikes);
    await insertAll(tx, odometerReadings, s.odometerReadings);
    await insertAll(tx, serviceRecords, s.serviceRecords);
    await insertAll(tx, valveChecks, s.valveChecks);
    await insertAll(tx, valveReadings, s.valveReadings);
    await insertAll(tx, defects, s.defects);
    await insertAll(tx, shimStock, s.shimStock);
    await seedCapacity(tx, s);
    await seedBookings(tx, s);
    await seedParts(tx, s);
  });
  const n = (x: number, one: string, many = `${one}s`) => `${x.toLocaleString('en-GB')} ${x === 1 ? one : many}`;
  return [
    n(s.sites.length, 'site'), n(s.users.length, 'person', 'people'), n(s.models.length, 'model'), n(s.bikes.length, 'bike'),
    n(s.odometerReadings.length, 'odometer reading'), n(s.serviceRecords.length, 'service record'),
    n(s.valveChecks.length, 'valve check'),
  ].join(', ');
}
