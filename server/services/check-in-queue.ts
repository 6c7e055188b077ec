import type { Db } from '../db/client';
import type { CheckIn, DueItem } from '../../shared/schemas/due';
import type { SessionUser } from '../../shared/schemas/auth';
import type { BikeSummary } from '../../shared/schemas/bikes';
import { batchable, recordCheckIn, recordCheckIns, type CheckInJob, type CheckInOutcome } from './check-in';
import { getBike, listBikes } from './bikes';
import { dueItemsFromComputed, dueItemsOf, openTasks } from './due-list';
import { log } from '../logger';

type Result = Awaited<ReturnType<typeof recordCheckIn>>;

/** What the counter is told: the reading stored, the bike as it stands now and its due items. */
export interface CheckInAnswer {
  reading: Result['reading'];
  grounded: boolean;
  defectId: string | null;
  bike: BikeSummary;
  due: DueItem[];
}

interface Waiting {
  job: CheckInJob;
  resolve: (r: CheckInAnswer) => void;
  reject: (e: unknown) => void;
}

/**
 * Group commit for check-ins: those that arrive while the database is busy with the last batch are
 * written together in the next one, each bike once per batch (a second reading of the same bike waits
 * for the next batch, so it is judged against the first). Nothing waits on a timer: a lone check-in is
 * written at once. A batch that fails as a whole (not one reading refused) is retried one by one, so
 * one bad row never costs the others their write.
 */
export class CheckInQueue {
  private waiting: Waiting[] = [];
  private running = false;
  /** Batches written, and the largest: how much the grouping saves under load. */
  readonly stats = { batches: 0, largest: 0 };

  constructor(
    private readonly db: Db,
    private readonly now: () => Date,
    private readonly maxBatch = 100,
  ) {}

  record(user: SessionUser, bikeId: string, input: CheckIn, now = this.now()): Promise<CheckInAnswer> {
    if (!batchable(input)) return this.one({ user, bikeId, input }, now);
    return new Promise<CheckInAnswer>((resolve, reject) => {
      this.waiting.push({ job: { user, bikeId, input }, resolve, reject });
      if (!this.running) {
        this.running = true;
        // Let the requests already read from their sockets join the first batch.
        setImmediate(() => void this.drain());
      }
    });
  }

  /** One check-in on its own (a defect, a replaced odometer, or a batch that failed as a whole). */
  private async one(job: CheckInJob, now: Date): Promise<CheckInAnswer> {
    const r = await recordCheckIn(this.db, job.user, job.bikeId, job.input, now);
    const bike = (await getBike(this.db, job.user.siteIds, job.bikeId))!;
    return { reading: r.reading, grounded: r.grounded, defectId: r.defectId, bike, due: await dueItemsFromComputed(this.db, bike, r.computed) };
  }

  /** The answers of a batch, read back together once it is committed. */
  private async answer(batch: Waiting[], outcomes: CheckInOutcome[]) {
    try {
      const stored = outcomes.flatMap((o) => (o.ok ? [o.result] : []));
      const ids = stored.map((r) => r.reading.bikeId);
      const siteIds = [...new Set(batch.flatMap((w) => w.job.user.siteIds))];
      const bikes = new Map((ids.length ? await listBikes(this.db, siteIds, { ids }) : []).map((b) => [b.id, b]));
      const tasks = await openTasks(this.db, ids);
      outcomes.forEach((o, i) => {
        if (!o.ok) return batch[i].reject(o.error);
        const bike = bikes.get(o.result.reading.bikeId)!;
        batch[i].resolve({ reading: o.result.reading, grounded: false, defectId: null, bike, due: dueItemsOf(bike, o.result.computed, tasks.get(bike.id)!) });
      });
    } catch (e) {
      // Stored, but the answer could not be read back: say so rather than leave the counter waiting.
      for (const w of batch) w.reject(e);
    }
  }

  private next(): Waiting[] {
    const batch: Waiting[] = [];
    const rest: Waiting[] = [];
    const bikes = new Set<string>();
    for (const w of this.waiting) {
      if (batch.length < this.maxBatch && !bikes.has(w.job.bikeId)) {
        bikes.add(w.job.bikeId);
        batch.push(w);
      } else rest.push(w);
    }
    this.waiting = rest;
    return batch;
  }

  private async drain() {
    try {
      while (this.waiting.length) {
        const batch = this.next();
        this.stats.batches++;
        this.stats.largest = Math.max(this.stats.largest, batch.length);
        let outcomes: CheckInOutcome[] | null = null;
        try {
          outcomes = await recordCheckIns(this.db, batch.map((w) => w.job), this.now());
        } catch (err) {
          // Written one by one below, each with its own answer; the batch's failure is not lost.
          log.warn({ err, checkIns: batch.length }, 'A batch of check-ins failed as a whole; each is written on its own.');
          outcomes = null;
        }
        if (outcomes) {
          await this.answer(batch, outcomes);
          continue;
        }
        for (const w of batch) await this.one(w.job, this.now()).then(w.resolve, w.reject);
      }
    } finally {
      this.running = false;
    }
  }
}
