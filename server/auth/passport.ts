import passport from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import type { Db } from '../db/client';
import { findUserByEmail, loadSessionUser } from '../services/users';
import { verifyPassword } from './passwords';

export const SIGN_IN_REFUSED = 'That e-mail and password do not match an active account. Check both and try again.';

/** A passport instance of this app's own (tests build several apps in one process). */
export function createPassport(db: Db) {
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
  p.deserializeUser((id: string, done) => {
    loadSessionUser(db, id).then((u) => done(null, u ?? false), done);
  });
  return p;
}
