import type { NextFunction, Request, Response } from 'express';
import { timingSafeEqual } from 'node:crypto';
import { csrfSync } from 'csrf-sync';
import { HttpError } from '../http-error';

const UNSAFE = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);

export const csrf = csrfSync({
  getTokenFromRequest: (req) => {
    const h = req.headers['x-csrf-token'];
    return typeof h === 'string' ? h : undefined;
  },
  errorConfig: { statusCode: 403, code: 'EBADCSRFTOKEN', message: 'csrf' },
});

/**
 * Browsers say where a request comes from: refuse unsafe requests sent from another site,
 * by Sec-Fetch-Site where the browser sends it and by Origin where it does not.
 */
export function refuseCrossSite(req: Request, _res: Response, next: NextFunction) {
  if (!UNSAFE.has(req.method)) return next();
  const site = req.headers['sec-fetch-site'];
  if (site === 'cross-site') return next(crossSite());
  const origin = req.headers.origin;
  if (!site && origin && origin !== 'null') {
    let host: string;
    try {
      host = new URL(origin).host;
    } catch {
      return next(crossSite());
    }
    if (host !== req.headers.host) return next(crossSite());
  }
  next();
}

const crossSite = () =>
  new HttpError(403, 'csrf_failed', 'This request came from another site and was refused. Open Lashline directly and try again.');

export const JOB_TOKEN_HEADER = 'x-lashline-job-token';

/** True when a request carries the running server's local job token (the command-line job runner). */
export function hasJobToken(req: Request, jobToken: string | undefined) {
  const h = req.headers[JOB_TOKEN_HEADER];
  if (!jobToken || typeof h !== 'string' || h.length !== jobToken.length) return false;
  return timingSafeEqual(Buffer.from(h), Buffer.from(jobToken));
}

export const csrfProtection = (jobToken?: string) => (req: Request, res: Response, next: NextFunction) => {
  // A secret header cannot be sent by another site's page, so the local job runner needs no session token.
  if (hasJobToken(req, jobToken)) return next();
  csrf.csrfSynchronisedProtection(req, res, (err?: unknown) => {
    if (err)
      return next(
        new HttpError(403, 'csrf_failed', 'Your page is out of date or the security token is missing. Reload the page and try again.'),
      );
    next();
  });
};
