import { asc, eq, inArray, sql } from 'drizzle-orm';
import type { Database } from '../server/db/client';
import { bays, bikes, bookings, siteHours, sites, userSites, users, workPatterns } from '../server/db/schema';
import { createRng } from '../shared/domain/prng';
import { runPlan } from '../server/services/workshop-plan';
import { loadPlanInput } from '../server/services/workshop-plan-inputs';
import { dueWithinHorizon, planWorkshop, greedyPlan, planObjective } from '../shared/domain/planner';
import { mipBound, scalarObjective } from '../shared/domain/plan-mip';
import { addDaysIso, startOfDayInZone, todayInZone } from '../shared/domain/dates';
import type { PlanObjective } from '../shared/domain/plan-types';
import { cpuMs } from './scan-bench';

export interface PlanFigures {
  bikes: number;
  bays: number;
  technicians: number;
  bookings: number;
  tasks: number;
  full: { ms: number; cpuMs: number; visits: number; unplaced: number };
  repeatMs: number;
  replanOneMs: number;
  /** The planner alone on the loaded inputs, and the earliest-due-date greedy floor. */
  pureMs: number;
  greedyMs: number;
  objective: number;
  greedyObjective: number;
  /** The objective's terms, in priority order, for the plan and the greedy floor. */
  terms: PlanObjective;
  greedyTerms: PlanObjective;
  lpBound: number | null;
  lpStatus: string;
}

const BAYS_PER_SITE = 6;
const TECHS_PER_SITE = 8;
const BOOKINGS = 3000;

/**
 * The planning load on a generated fleet: 6 bays and 8 technicians per site (Mon–Fri 08:00–16:30,
 * half of them also alternate Saturdays), opening hours Mon–Sat, and 3,000 hires and lessons over
 * the next two weeks (four in five for one bike, the rest for a number of bikes of a model).
 */
export async function seedPlanningLoad(database: Database, today: Date, seed = 'lashline-plan-bench') {
  const db = database.db;
  const rng = createRng(seed);
  const siteRows = await db.select().from(sites).orderBy(asc(sites.name));
  await db.transaction(async (tx) => {
    for (const [si, s] of siteRows.entries()) {
      await tx.delete(bays).where(eq(bays.siteId, s.id));
      await tx.insert(bays).values(Array.from({ length: BAYS_PER_SITE }, (_, i) => ({ siteId: s.id, name: `Bay ${i + 1}`, position: i + 1 })));
      await tx.update(sites).set({ bays: BAYS_PER_SITE }).where(eq(sites.id, s.id));
      await tx.delete(siteHours).where(eq(siteHours.siteId, s.id));
      await tx.insert(siteHours).values([1, 2, 3, 4, 5, 6].map((weekday) => ({ siteId: s.id, weekday, opensAt: '08:00', closesAt: '17:30' })));
      const existing = await tx.select({ id: users.id }).from(users).innerJoin(userSites, eq(userSites.userId, users.id)).where(sql`${users.role} = 'technician' and ${userSites.siteId} = ${s.id}`);
      const techIds = existing.map((u) => u.id);
      for (let i = techIds.length; i < TECHS_PER_SITE; i++) {
        const [u] = await tx.insert(users).values({ email: `bench-tech-${si + 1}-${i + 1}@bench.test`, name: `Bench technician ${si + 1}.${i + 1}`, role: 'technician' }).returning({ id: users.id });
        await tx.insert(userSites).values({ userId: u.id, siteId: s.id });
        techIds.push(u.id);
      }
      await tx.delete(workPatterns).where(inArray(workPatterns.userId, techIds));
      const monday = addDaysIso(todayInZone(s.timeZone, today), -7);
      for (const [i, id] of techIds.entries()) {
        await tx.insert(workPatterns).values({ userId: id, siteId: s.id, rrule: 'FREQ=WEEKLY;BYDAY=MO,TU,WE,TH,FR', startsOn: monday, startTime: '08:00', endTime: '16:30' });
        if (i % 2 === 0) await tx.insert(workPatterns).values({ userId: id, siteId: s.id, rrule: 'FREQ=WEEKLY;INTERVAL=2;BYDAY=SA', startsOn: monday, startTime: '08:00', endTime: '12:30' });
      }
    }
    await tx.delete(bookings);
    const fleet = await tx.select({ id: bikes.id, siteId: bikes.siteId, modelId: bikes.modelId }).from(bikes).orderBy(asc(bikes.fleetNumber));
    const rows: (typeof bookings.$inferInsert)[] = [];
    for (let i = 0; i < BOOKINGS; i++) {
      const b = fleet[rng.int(0, fleet.length - 1)];
      const site = siteRows.find((s) => s.id === b.siteId)!;
      const day = addDaysIso(todayInZone(site.timeZone, today), rng.int(0, 13));
      const dayStart = startOfDayInZone(day, site.timeZone);
      const start = dayStart + rng.pick([8, 9, 10, 13]) * 3_600_000;
      const hours = rng.pick([3, 4, 8, 8, 24, 48]);
      const perBike = rng.chance(0.8);
      rows.push({
        siteId: b.siteId,
        kind: rng.chance(0.6) ? 'hire' : 'lesson',
        bikeId: perBike ? b.id : null,
        modelId: perBike ? null : b.modelId,
        quantity: perBike ? 1 : rng.int(1, 3),
        startAt: new Date(start),
        endAt: new Date(start + hours * 3_600_000),
        title: `Bench booking ${i + 1}`,
        source: 'manual',
      });
    }
    for (let i = 0; i < rows.length; i += 500) await tx.insert(bookings).values(rows.slice(i, i + 500));
  });
  const techs = await db.execute(sql`select count(distinct user_id)::int as n from work_patterns`);
  return { bays: BAYS_PER_SITE * siteRows.length, technicians: (techs as unknown as { rows: { n: number }[] }).rows[0].n, bookings: BOOKINGS };
}

/** A full plan (twice: the first replaces nothing, the repeat matches every visit), a re-plan of one bike as after a check-in, and the floors. */
export async function planPhase(database: Database, bikeCount: number): Promise<PlanFigures> {
  const now = new Date();
  const seeded = await seedPlanningLoad(database, now);
  const siteIds = (await database.db.select({ id: sites.id }).from(sites)).map((s) => s.id);
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  const first = await runPlan(database.db, { siteIds, why: 'benchmark', now });
  const fullMs = performance.now() - t0;
  const fullCpu = cpuMs(c0);
  const t1 = performance.now();
  await runPlan(database.db, { siteIds, why: 'benchmark repeat', now });
  const repeatMs = performance.now() - t1;
  // A check-in re-plans its bike's work around every other visit.
  const picked = (await database.db.execute(sql`select bike_id as "bikeId", site_id as "siteId" from visits where status = 'planned' order by start_at desc, id limit 1`)) as unknown as { rows: { bikeId: string; siteId: string }[] };
  const oneRow = picked.rows[0];
  const t2 = performance.now();
  await runPlan(database.db, { siteIds: [oneRow.siteId], bikeIds: [oneRow.bikeId], why: 'benchmark check-in', now });
  const replanOneMs = performance.now() - t2;

  const loaded = await loadPlanInput(database.db, { siteIds, now: new Date(now.getTime() + 1) });
  // Everything re-planned from scratch for the pure figures, on what a plan takes in (work due
  // inside the horizon, with its window), as runPlan does.
  const input = dueWithinHorizon(loaded.input);
  const p0 = performance.now();
  const result = planWorkshop(input);
  const pureMs = performance.now() - p0;
  const g0 = performance.now();
  const greedy = greedyPlan(input);
  const greedyMs = performance.now() - g0;
  const bound = await mipBound(input, { relax: true, timeLimit: 60 });
  const terms = planObjective(input, result.visits, result.unplaced);
  const greedyTerms = planObjective(input, greedy.visits, greedy.unplaced);
  return {
    bikes: bikeCount,
    bays: seeded.bays,
    technicians: seeded.technicians,
    bookings: seeded.bookings,
    tasks: input.tasks.length,
    full: { ms: fullMs, cpuMs: fullCpu, visits: first.visits, unplaced: first.unplaced },
    repeatMs,
    replanOneMs,
    pureMs,
    greedyMs,
    objective: scalarObjective(terms),
    greedyObjective: scalarObjective(greedyTerms),
    terms,
    greedyTerms,
    lpBound: bound.lpBound ?? bound.objective ?? null,
    lpStatus: String(bound.status),
  };
}
