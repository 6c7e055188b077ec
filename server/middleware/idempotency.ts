import { createHash } from 'node:crypto';
import type { NextFunction, Request, Response } from 'express';
import { and, eq, isNull, lt } from 'drizzle-orm';
import type { AppContext } from '../app';
import { idempotentRequests } from '../db/schema';
import { HttpError } from '../http-error';
import type { SessionUser } from '../../shared/schemas/auth';
import { IDEMPOTENCY_HEADER, IDEMPOTENCY_KEY_PATTERN, IDEMPOTENCY_KEEP_HOURS } from '../../shared/domain/idempotency';
import { log } from '../logger';

const UNSAFE = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);
const KEEP_MS = IDEMPOTENCY_KEEP_HOURS * 3_600_000;
/** A first request that has neither answered nor failed in this long died with its server. */
const ABANDONED_MS = 2 * 60_000;
/** Answers worth replaying: what the request did, or why it was refused. Not a lost session, a throttle or a failure of ours. */
const replayable = (status: number) => status < 500 && ![401, 403, 408, 429].includes(status);

const reused = () =>
  new HttpError(422, 'key_reused', 'This Idempotency-Key was already used for a different request. Send each new change with a key of its own (a fresh UUID).');
const inProgress = () =>
  new HttpError(409, 'in_progress', 'The first request with this Idempotency-Key is still being worked on. Try again in a moment: it will not be applied twice.');

/**
 * What identifies a request besides its key: method, path and body. A multipart upload's body is
 * not read here (the browser draws a new boundary on every try), so there the key alone counts.
 */
function fingerprintOf(req: Request) {
  const multipart = req.is('multipart/form-data');
  const body = multipart ? 'multipart' : JSON.stringify(req.body ?? null);
  return createHash('sha256').update(`${req.method}\n${req.originalUrl}\n${body}`).digest('hex');
}

/**
 * Unsafe requests sent with an `Idempotency-Key` header are applied once per signed-in person and
 * key: the answer is kept for a day and a repeat of the same request gets it again, marked
 * `Idempotent-Replayed: true`; the same key with another body is refused (422); a repeat that
 * arrives while the first is still being worked on is told so (409) and changes nothing. Requests
 * without the header are untouched.
 */
export function idempotency(ctx: AppContext) {
  const db = ctx.database.db;
  let prunedAt = 0;
  return async (req: Request, res: Response, next: NextFunction) => {
    if (!UNSAFE.has(req.method)) return next();
    const key = req.get(IDEMPOTENCY_HEADER);
    if (key === undefined) return next();
    try {
      if (!IDEMPOTENCY_KEY_PATTERN.test(key))
        throw new HttpError(400, 'validation_failed', 'The Idempotency-Key header must be 8 to 128 letters, digits, dashes or underscores; a UUID will do.');
      const user = req.user as SessionUser | undefined;
      // Not signed in: the route refuses it, and nothing is kept for nobody.
      if (!user) return next();
      const now = ctx.now();
      if (now.getTime() - prunedAt > 3_600_000) {
        prunedAt = now.getTime();
        await db.delete(idempotentRequests).where(lt(idempotentRequests.createdAt, new Date(now.getTime() - KEEP_MS)));
      }
      const fingerprint = fingerprintOf(req);
      const mine = and(eq(idempotentRequests.userId, user.id), eq(idempotentRequests.key, key));
      // One statement claims the key: a new row, or the row of a key older than a day (forgotten).
      const claim = { fingerprint, method: req.method, path: req.originalUrl, status: null, contentType: null, body: null, createdAt: now };
      const claimed = await db
        .insert(idempotentRequests)
        .values({ userId: user.id, key, ...claim })
        .onConflictDoUpdate({ target: [idempotentRequests.userId, idempotentRequests.key], set: claim, setWhere: lt(idempotentRequests.createdAt, new Date(now.getTime() - KEEP_MS)) })
        .returning({ key: idempotentRequests.key });
      if (!claimed.length) {
        const [held] = await db.select().from(idempotentRequests).where(mine);
        if (!held) throw inProgress();
        if (held.fingerprint !== fingerprint) throw reused();
        if (held.status === null) {
          // The first try's server died before answering: the first repeat takes its place.
          const taken = await db
            .update(idempotentRequests)
            .set({ createdAt: now })
            .where(and(mine, isNull(idempotentRequests.status), lt(idempotentRequests.createdAt, new Date(now.getTime() - ABANDONED_MS))))
            .returning({ key: idempotentRequests.key });
          if (!taken.length) throw inProgress();
        } else {
          res.setHeader('Idempotent-Replayed', 'true');
          if (held.contentType) res.setHeader('Content-Type', held.contentType);
          res.status(held.status);
          return held.body === null ? res.end() : res.send(held.body);
        }
      }
      keepAnswer(req, res, async (status, contentType, body) => {
        if (replayable(status)) await db.update(idempotentRequests).set({ status, contentType, body }).where(mine);
        else await db.delete(idempotentRequests).where(mine);
      });
      next();
    } catch (e) {
      next(e);
    }
  };
}

/**
 * Stores the answer before it leaves, so a repeat sent the moment the first answer is lost finds
 * it. A streamed answer (no `send`) cannot be replayed: its claim is dropped once it is over, and
 * an answer with no body (204) is kept as such.
 */
function keepAnswer(req: Request, res: Response, store: (status: number, contentType: string | null, body: string | null) => Promise<void>) {
  let done = false;
  const send = res.send.bind(res);
  const failed = (err: unknown) => log.error({ err, method: req.method, path: req.originalUrl }, 'The answer of an idempotent request could not be kept.');
  res.send = (body?: unknown) => {
    if (done) return send(body);
    done = true;
    const text = body === undefined || body === null ? null : Buffer.isBuffer(body) ? body.toString('utf8') : typeof body === 'string' ? body : JSON.stringify(body);
    const type = res.getHeader('Content-Type');
    void store(res.statusCode, typeof type === 'string' ? type : text === null ? null : 'application/json; charset=utf-8', text)
      .catch(failed)
      .finally(() => send(body));
    return res;
  };
  res.on('finish', () => {
    if (done) return;
    done = true;
    void store(res.statusCode === 204 ? 204 : 500, null, null).catch(failed);
  });
}
