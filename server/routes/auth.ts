import { Router, type NextFunction, type Request, type Response } from 'express';
import type { PassportStatic } from 'passport';
import { rateLimit } from 'express-rate-limit';
import type { AppContext } from '../app';
import { publicRoute, signedIn } from '../middleware/auth';
import { validate, validated } from '../middleware/validate';
import { csrf } from '../middleware/csrf';
import { HttpError } from '../http-error';
import { AcceptInviteSchema } from '../../shared/schemas/users';
import { LoginSchema, SetupSchema, type SessionUser } from '../../shared/schemas/auth';
import { SIGN_IN_REFUSED } from '../auth/passport';
import { acceptInvite, needsSetup, runFirstSetup } from '../services/accounts';

type Passport = InstanceType<PassportStatic['Passport']>;

function throttled(message: string) {
  return (_req: Request, _res: Response, next: NextFunction) => next(new HttpError(429, 'too_many_requests', message));
}

export function authRoutes(ctx: AppContext, passport: Passport) {
  const r = Router();
  const windowMs = ctx.config.LOGIN_WINDOW_MINUTES * 60_000;
  const wait = `Too many sign-in attempts. Wait ${ctx.config.LOGIN_WINDOW_MINUTES} minutes and try again, or ask an administrator.`;
  const perAddress = rateLimit({ windowMs, limit: ctx.config.LOGIN_MAX_PER_IP, standardHeaders: 'draft-8', legacyHeaders: false, handler: throttled(wait) });
  const perAccount = rateLimit({
    windowMs,
    limit: ctx.config.LOGIN_MAX_PER_ACCOUNT,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: (req) => `acct:${String((req.body as { email?: unknown })?.email ?? '').trim().toLowerCase()}`,
    handler: throttled(wait),
  });

  /** Signs a user in on a new session id and hands back a token for the new session. */
  const signIn = (req: Request, res: Response, next: NextFunction, user: SessionUser, status = 200) =>
    req.login(user, (err) => {
      if (err) return next(err);
      req.session.createdAt = ctx.now().getTime();
      res.status(status).json({ user: publicUser(user), csrfToken: csrf.generateToken(req, true) });
    });

  r.get('/csrf', publicRoute(), (req, res) => {
    req.session.createdAt ??= ctx.now().getTime();
    res.json({ token: csrf.generateToken(req) });
  });

  r.post('/login', publicRoute(), perAddress, perAccount, validate({ body: LoginSchema }), (req, res, next) => {
    passport.authenticate('local', (err: unknown, user: SessionUser | false) => {
      if (err) return next(err);
      if (!user) return next(new HttpError(401, 'not_signed_in', SIGN_IN_REFUSED));
      signIn(req, res, next, user);
    })(req, res, next);
  });

  r.post('/logout', signedIn(), (req, res, next) => {
    req.logout((err) => {
      if (err) return next(err);
      req.session.destroy(() => {
        res.clearCookie('lashline.sid');
        res.status(204).end();
      });
    });
  });

  r.get('/me', signedIn(), (req, res) => {
    res.json({ user: publicUser(req.user!) });
  });

  r.get('/setup', publicRoute(), async (_req, res) => {
    res.json({ needed: await needsSetup(ctx.database.db) });
  });

  r.post('/setup', publicRoute(), perAddress, ...validated({ body: SetupSchema }, async (req, res, v, next) => {
    const user = await runFirstSetup(ctx.database.db, v.body);
    signIn(req, res, next, user, 201);
  }));

  r.post('/accept-invite', publicRoute(), perAddress, ...validated({ body: AcceptInviteSchema }, async (req, res, v, next) => {
    const body = v.body;
    const user = await acceptInvite(ctx.database.db, body.token, body.password, ctx.now());
    signIn(req, res, next, user);
  }));
  return r;
}

function publicUser(u: SessionUser) {
  return { id: u.id, email: u.email, name: u.name, role: u.role, siteIds: u.siteIds };
}
