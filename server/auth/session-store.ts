import { eq, lt } from 'drizzle-orm';
import session from 'express-session';
import { LRUCache } from 'lru-cache';
import type { ChangeFeed, Db } from '../db/client';
import { sessions } from '../db/schema';

type Callback = (err?: unknown, value?: unknown) => void;
const DEFAULT_TTL_MS = 30 * 60_000;
/**
 * A busy screen sends several requests a second; the stored expiry moves on at most once a minute
 * per session, so a session ends between 29 and 30 idle minutes after its last request.
 */
export const TOUCH_EVERY_MS = 60_000;

interface Held {
  /** The stored session as JSON, parsed afresh for every request (express-session changes what it gets). */
  json: string;
  expire: number;
}

/**
 * Sessions in the database (same schema on PGlite and PostgreSQL), so every app instance sees them.
 * With a change feed (embedded PGlite), sessions read are kept in memory until the database says
 * that row changed or went, so a request does not read its session row again.
 */
export class DbSessionStore extends session.Store {
  /** When this process last wrote each session's expiry. */
  private readonly touched = new LRUCache<string, number>({ max: 100_000 });
  private readonly held?: LRUCache<string, Held>;
  /** Moves on with every change notification: a read that started before one is not kept. */
  private changes = 0;

  constructor(
    private readonly db: Db,
    feed?: ChangeFeed,
  ) {
    super();
    if (!feed) return;
    this.held = new LRUCache<string, Held>({ max: 20_000 });
    feed.on('lashline_session', (sid) => {
      this.changes++;
      if (sid === '*') this.held!.clear();
      else this.held!.delete(sid);
    });
  }

  private expiry(sess: session.SessionData) {
    const ms = sess.cookie?.expires ? new Date(sess.cookie.expires).getTime() : Date.now() + DEFAULT_TTL_MS;
    return new Date(ms);
  }

  private static userId(sess: session.SessionData): string | null {
    const id = (sess as { passport?: { user?: unknown } }).passport?.user;
    return typeof id === 'string' ? id : null;
  }

  override get(sid: string, cb: (err: unknown, sess?: session.SessionData | null) => void) {
    const held = this.held?.get(sid);
    if (held) return cb(null, held.expire > Date.now() ? (JSON.parse(held.json) as session.SessionData) : null);
    const before = this.changes;
    this.db
      .select()
      .from(sessions)
      .where(eq(sessions.sid, sid))
      .then(([row]) => {
        if (row && this.held && this.changes === before) this.held.set(sid, { json: JSON.stringify(row.sess), expire: row.expire.getTime() });
        cb(null, row && row.expire.getTime() > Date.now() ? (row.sess as session.SessionData) : null);
      }, cb);
  }

  override set(sid: string, sess: session.SessionData, cb?: Callback) {
    const row = { sid, sess, expire: this.expiry(sess), userId: DbSessionStore.userId(sess) };
    this.touched.set(sid, Date.now());
    this.db
      .insert(sessions)
      .values(row)
      .onConflictDoUpdate({ target: sessions.sid, set: { sess: row.sess, expire: row.expire, userId: row.userId } })
      .then(() => cb?.(), (e) => cb?.(e));
  }

  override touch(sid: string, sess: session.SessionData, cb?: Callback) {
    const now = Date.now();
    const last = this.touched.get(sid);
    if (last !== undefined && now - last < TOUCH_EVERY_MS) return cb?.();
    this.touched.set(sid, now);
    this.db
      .update(sessions)
      .set({ expire: this.expiry(sess) })
      .where(eq(sessions.sid, sid))
      .then(() => cb?.(), (e) => cb?.(e));
  }

  override destroy(sid: string, cb?: Callback) {
    this.touched.delete(sid);
    this.held?.delete(sid);
    this.db
      .delete(sessions)
      .where(eq(sessions.sid, sid))
      .then(() => cb?.(), (e) => cb?.(e));
  }

  /** Ends every session of a user (sign-out everywhere, a disabled account). */
  async destroyForUser(userId: string) {
    await this.db.delete(sessions).where(eq(sessions.userId, userId));
  }

  async prune() {
    await this.db.delete(sessions).where(lt(sessions.expire, new Date()));
  }
}
