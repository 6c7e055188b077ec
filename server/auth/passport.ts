import passport from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import type { Request } from 'express';
import type { Db } from '../db/client';
import type { ReadCache } from '../cache/read-cache';
import type { SessionUser } from '../../shared/schemas/auth';
import { findUserByEmail, loadSessionUser } from '../services/users';
import { verifyPassword } from './passwords';

export const SIGN_IN_REFUSED = 'That e-mail and password do not match an active account. Check both and try again.';

/** A passport instance of this app's own (tests build several apps in one process). */
export function createPassport(db: Db, cache: ReadCache) {
  const p = new passport.Passport();
  p.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password' }, (email, password, done) => {
      (async () => {
        const row = await findUserByEmail(db, email);
        const ok = await verifyPassword(row?.passwordHash ?? null, password);
        if (!row || !ok || row.disabled) return done(null, false, { message: SIGN_IN_REFUSED });
        return done(null, (await loadSessionUser(db, row.id)) ?? false);
      })().catch(done);
    }),
  );
  p.serializeUser((user, done) => done(null, user.id));
  // Every request loads its person: from the read cache while no person, site or role has changed.
  p.deserializeUser((req: Request, id: string, done: (err: unknown, user?: SessionUser | false) => void) => {
    cache
      .get(`session-user\n${id}`, () => loadSessionUser(db, id), { req, scope: 'people' })
      .then((a) => done(null, (JSON.parse(a.body.toString()) as SessionUser | null) ?? false), done);
  });
  return p;
}
