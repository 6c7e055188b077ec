import type { Db } from '../../server/db/client';
import { bays, bikeModels, bikes, serviceItems, sites, userSites, users } from '../../server/db/schema';
import { hashPassword } from '../../server/auth/passwords';
import type { Role } from '../../shared/roles';

export const PASSWORD = 'correct-horse-battery';
let hashed: Promise<string> | undefined;
const passwordHash = () => (hashed ??= hashPassword(PASSWORD));
let seq = 0;

/** A site with its bay rows ("Bay 1" …), as many as its `bays` count. */
export async function makeSite(db: Db, name = `Site ${++seq}`, bayCount = 1) {
  const [row] = await db.insert(sites).values({ name, timeZone: 'Europe/London', bays: bayCount }).returning();
  for (let i = 1; i <= bayCount; i++) await db.insert(bays).values({ siteId: row.id, name: `Bay ${i}`, position: i });
  return row;
}

export async function makeUser(db: Db, role: Role, siteIds: string[], over: Partial<typeof users.$inferInsert> = {}) {
  const n = ++seq;
  const [row] = await db
    .insert(users)
    .values({ email: `${role}${n}@example.test`, name: `${role} ${n}`, role, passwordHash: await passwordHash(), ...over })
    .returning();
  if (siteIds.length) await db.insert(userSites).values(siteIds.map((siteId) => ({ userId: row.id, siteId })));
  return row;
}

export async function makeModel(db: Db, over: Partial<typeof bikeModels.$inferInsert> = {}) {
  const [row] = await db
    .insert(bikeModels)
    .values({
      name: `Model ${++seq}`,
      cylinders: 2,
      intakeValvesPerCylinder: 2,
      exhaustValvesPerCylinder: 2,
      adjuster: 'shim-under-bucket',
      intakeMinUm: 100,
      intakeMaxUm: 200,
      exhaustMinUm: 200,
      exhaustMaxUm: 300,
      shimMinUm: 1200,
      shimMaxUm: 3500,
      shimStepUm: 50,
      ...over,
    })
    .returning();
  return row;
}

export async function makeServiceItem(db: Db, modelId: string, over: Partial<typeof serviceItems.$inferInsert> = {}) {
  const [row] = await db
    .insert(serviceItems)
    .values({ modelId, name: `Item ${++seq}`, category: 'oil', everyKm: 5000, everyMonths: 6, ...over })
    .returning();
  return row;
}

export async function makeBike(db: Db, modelId: string, siteId: string, over: Partial<typeof bikes.$inferInsert> = {}) {
  const [row] = await db
    .insert(bikes)
    .values({ fleetNumber: `T-${++seq}`, modelId, siteId, inServiceDate: '2025-01-01', inServiceOdometer: 0, ...over })
    .returning();
  return row;
}

/** Two sites, a person of every role at the first (manager and admin at both), a model and a bike at each site. */
export async function world(db: Db) {
  const a = await makeSite(db);
  const b = await makeSite(db);
  const model = await makeModel(db);
  const people = {
    admin: await makeUser(db, 'admin', [a.id, b.id]),
    manager: await makeUser(db, 'manager', [a.id, b.id]),
    technician: await makeUser(db, 'technician', [a.id]),
    desk: await makeUser(db, 'desk', [a.id]),
    technicianB: await makeUser(db, 'technician', [b.id]),
  };
  const bikeA = await makeBike(db, model.id, a.id);
  const bikeB = await makeBike(db, model.id, b.id);
  return { siteA: a, siteB: b, model, people, bikeA, bikeB };
}
