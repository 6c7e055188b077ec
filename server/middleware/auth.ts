import type { NextFunction, Request, RequestHandler, Response } from 'express';
import type { Role } from '../../shared/roles';
import { HttpError } from '../http-error';

/** Marks the access rule on a route's first handler, so unruled routes can be found and refused. */
export const RULE = Symbol('lashline.rule');

export type Rule = { kind: 'public' } | { kind: 'signed-in' } | { kind: 'roles'; roles: readonly Role[] };
export type RuledHandler = RequestHandler & { [RULE]: Rule };

function tag(rule: Rule, fn: RequestHandler): RuledHandler {
  return Object.assign(fn, { [RULE]: rule });
}

const notSignedIn = () => new HttpError(401, 'not_signed_in', 'Sign in to continue. Your session may have ended.');

/** Open to anyone, signed in or not (health, sign-in, the calendar feed with its secret). */
export const publicRoute = () => tag({ kind: 'public' }, (_req, _res, next) => next());

export const signedIn = () =>
  tag({ kind: 'signed-in' }, (req: Request, _res: Response, next: NextFunction) =>
    req.user ? next() : next(notSignedIn()),
  );

export const requireRole = (...roles: Role[]) =>
  tag({ kind: 'roles', roles }, (req: Request, _res: Response, next: NextFunction) => {
    if (!req.user) return next(notSignedIn());
    if (!roles.includes(req.user.role))
      return next(new HttpError(403, 'forbidden', `This needs the role ${roles.join(' or ')}; you are signed in as ${req.user.role}.`));
    next();
  });

export function ruleOf(fn: unknown): Rule | undefined {
  return typeof fn === 'function' ? (fn as Partial<RuledHandler>)[RULE] : undefined;
}

export function currentUser(req: Request) {
  if (!req.user) throw notSignedIn();
  return req.user;
}

/** A role rule that also admits the running server's local job runner, which holds a secret token instead of a session. */
export const requireRoleOrJobToken = (allowed: (req: Request) => boolean, ...roles: Role[]) => {
  const byRole = requireRole(...roles);
  return tag({ kind: 'roles', roles }, (req: Request, res: Response, next: NextFunction) => (allowed(req) ? next() : byRole(req, res, next)));
};
