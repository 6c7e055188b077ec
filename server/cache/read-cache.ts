import { createHash } from 'node:crypto';
import { promisify } from 'node:util';
import { gzip } from 'node:zlib';
import type { Request, Response } from 'express';
import { LRUCache } from 'lru-cache';
import { sql } from 'drizzle-orm';
import type { ChangeFeed, Db } from '../db/client';

/**
 * 'fleet' moves on with any write to the fleet's data; 'people' only with people, their sites and the
 * sites; 'valves' only with what valve trends are made of (valve checks and readings, services done,
 * bikes, models and their plans), not with every check-in.
 */
export type DataScope = 'fleet' | 'people' | 'valves';
const SCOPES: readonly DataScope[] = ['fleet', 'people', 'valves'];

/** A cached answer: the JSON body as the bytes sent, and the data version it was read at. */
interface Entry {
  version: number;
  body: Buffer;
  etag: string;
  /** The body gzipped, made on the first request that accepts it. */
  gzipped?: Promise<Buffer>;
}

export interface CachedAnswer {
  body: Buffer;
  etag: string;
  hit: boolean;
  gzipped: () => Promise<Buffer>;
}

/**
 * Answers of heavy fleet-wide reads (the due list, the fleet register, valve warnings and trends)
 * kept as JSON bytes, each valid while the data version of its scope has not moved. The version is
 * read first, then the data: a write that commits in between only makes the entry look older than it
 * is, never newer, so a stale answer is never served. Concurrent misses for one key share one
 * computation.
 */
export class ReadCache {
  private readonly entries: LRUCache<string, Entry>;
  private readonly pending = new Map<string, Promise<Entry>>();
  /** Worked-out values (not answers) kept against the versions of several scopes. */
  private readonly values = new LRUCache<string, { version: string; value: unknown }>({ max: 64 });
  private readonly pendingValues = new Map<string, Promise<unknown>>();
  /** The version read once per request: every cached read in it is checked against that one read. */
  private readonly perRequest = new WeakMap<object, Promise<Record<DataScope, number>>>();
  /**
   * With a change feed: the versions as last read, until a commit moves any of them on. Dropped
   * before the committing call returns, so a read after a write always sees the new versions.
   */
  private known?: Promise<Record<DataScope, number>>;
  private readonly feed?: ChangeFeed;

  constructor(
    private readonly db: Db,
    opts: { maxBytes?: number; changes?: ChangeFeed } = {},
  ) {
    this.entries = new LRUCache<string, Entry>({ maxSize: opts.maxBytes ?? 32 * 1024 * 1024, sizeCalculation: (e) => e.body.length + 200 });
    this.feed = opts.changes;
    this.feed?.on('lashline_data', () => {
      this.known = undefined;
    });
  }

  async version(scope: DataScope = 'fleet'): Promise<number> {
    return (await this.versions())[scope];
  }

  /** Every scope's version in one read. No row (a database restored from outside the app): nothing can be trusted, so nothing is cached. */
  versions(): Promise<Record<DataScope, number>> {
    if (!this.feed) return this.readVersions();
    if (!this.known) {
      const read = this.readVersions();
      // A failed read is not kept.
      read.catch(() => {
        if (this.known === read) this.known = undefined;
      });
      this.known = read;
    }
    return this.known;
  }

  private async readVersions(): Promise<Record<DataScope, number>> {
    const { rows } = (await this.db.execute(sql`select scope, n from data_versions`)) as unknown as { rows: { scope: string; n: number | string }[] };
    const of = (scope: DataScope) => {
      const row = rows.find((r) => r.scope === scope);
      return row ? Number(row.n) : Number.NaN;
    };
    return Object.fromEntries(SCOPES.map((s) => [s, of(s)])) as Record<DataScope, number>;
  }

  /**
   * The versions for one request, read once on first use. Safe for the reads of a request that has
   * not written yet (data read after the version is at least as new); a request that writes must not
   * read its own changes through the cache.
   */
  async versionFor(req: object, scope: DataScope = 'fleet'): Promise<number> {
    let v = this.perRequest.get(req);
    if (!v) this.perRequest.set(req, (v = this.versions()));
    return (await v)[scope];
  }

  async get(key: string, compute: () => Promise<unknown>, opts: { req?: object; scope?: DataScope } = {}): Promise<CachedAnswer> {
    const scope = opts.scope ?? 'fleet';
    const version = await (opts.req ? this.versionFor(opts.req, scope) : this.version(scope));
    key = `${scope}\n${key}`;
    const held = this.entries.get(key);
    if (held && held.version === version) return answer(held, true);
    const flightKey = `${version}\n${key}`;
    let flight = this.pending.get(flightKey);
    if (!flight) {
      flight = (async () => {
        const body = Buffer.from(JSON.stringify(await compute()));
        const entry = { version, body, etag: `W/"${createHash('sha1').update(body).digest('base64url')}"` };
        if (!Number.isNaN(version)) this.entries.set(key, entry);
        return entry;
      })().finally(() => this.pending.delete(flightKey));
      this.pending.set(flightKey, flight);
    }
    return answer(await flight, false);
  }

  /**
   * A value worked out from the data of some scopes (e.g. a site's parts simulation), kept until
   * any of them moves on; the key names whatever else it depends on. The versions are read before the data, as for answers. The value is
   * shared: callers must not change it.
   */
  async remember<T>(key: string, scopes: readonly DataScope[], compute: () => Promise<T>): Promise<T> {
    const all = await this.versions();
    const version = scopes.map((s) => all[s]).join('.');
    const held = this.values.get(key);
    if (held && held.version === version) return held.value as T;
    const flightKey = `${version}\n${key}`;
    let flight = this.pendingValues.get(flightKey) as Promise<T> | undefined;
    if (!flight) {
      flight = (async () => {
        const value = await compute();
        if (!scopes.some((s) => Number.isNaN(all[s]))) this.values.set(key, { version, value });
        return value;
      })().finally(() => this.pendingValues.delete(flightKey));
      this.pendingValues.set(flightKey, flight);
    }
    return flight;
  }

  /**
   * The key of an answer for one person's sites and query at this moment: time is in quarter hours,
   * the step every time zone's midnight falls on, so "today" in any zone cannot change under a key.
   */
  static key(kind: string, siteIds: string[], query: unknown, now: Date) {
    return `${kind}\n${[...siteIds].sort().join(',')}\n${JSON.stringify(query ?? null)}\n${Math.floor(now.getTime() / 900_000)}`;
  }

  clear() {
    this.entries.clear();
    this.values.clear();
  }

  /**
   * Sends a cached JSON answer, or 304 when the browser already holds this very body. Private to
   * the signed-in person (the key carries their sites); the browser asks again every time.
   */
  async send(req: Request, res: Response, key: string, compute: () => Promise<unknown>, scope: DataScope = 'fleet') {
    const a = await this.get(key, compute, { req, scope });
    res.setHeader('Cache-Control', 'private, no-cache');
    res.setHeader('ETag', a.etag);
    res.setHeader('X-Lashline-Cache', a.hit ? 'hit' : 'miss');
    res.setHeader('Vary', 'Accept-Encoding');
    if (req.headers['if-none-match'] === a.etag) return res.status(304).end();
    res.type('application/json');
    if (a.body.length > 1024 && req.acceptsEncodings('gzip', 'identity') === 'gzip') {
      res.setHeader('Content-Encoding', 'gzip');
      return res.send(await a.gzipped());
    }
    res.send(a.body);
  }
}

const gzipAsync = promisify(gzip);

function answer(e: Entry, hit: boolean): CachedAnswer {
  return { body: e.body, etag: e.etag, hit, gzipped: () => (e.gzipped ??= gzipAsync(e.body)) };
}
