import type { NextFunction, Request, Response } from 'express';
import type { AppContext } from '../app';

/** Ends a session past its absolute lifetime, however active it has been. The idle limit is the cookie's rolling maxAge. */
export function sessionLifetime(ctx: AppContext) {
  const maxMs = ctx.config.SESSION_ABSOLUTE_HOURS * 3_600_000;
  return (req: Request, _res: Response, next: NextFunction) => {
    const s = req.session;
    if (!s) return next();
    const now = ctx.now().getTime();
    // Stamped at sign-in and when a token is issued; an untouched session has no age to check.
    if (!s.createdAt) return next();
    if (now - s.createdAt > maxMs) {
      return s.destroy(() => {
        // A fresh, empty session takes its place so the request goes on as signed out.
        req.sessionStore.generate(req);
        req.session.createdAt = now;
        next();
      });
    }
    next();
  };
}
