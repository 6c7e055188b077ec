import type { NextFunction, Request, RequestHandler, Response } from 'express';
import type { z, ZodType } from 'zod';
import { HttpError } from '../http-error';
import type { ErrorDetail } from '../../shared/errors';

export function zodDetails(error: z.ZodError, prefix?: string): ErrorDetail[] {
  return error.issues.map((i) => ({
    path: [prefix, ...i.path.map(String)].filter(Boolean).join('.') || (prefix ?? ''),
    message: i.message,
  }));
}

interface Shapes {
  body?: ZodType;
  query?: ZodType;
  params?: ZodType;
}

/** What a handler receives: each part it named, parsed and typed by its schema. */
export type Valid<S extends Shapes> = { [K in keyof S]: S[K] extends ZodType ? z.output<S[K]> : never };

type ValidHandler<S extends Shapes> = (req: Request, res: Response, valid: Valid<S>, next: NextFunction) => unknown;

/**
 * The parsing middleware and the handler in one: the handler gets the parsed body, query and
 * params typed by their schemas, so no route casts what it was given.
 * `r.post('/x', requireRole('manager'), ...validated({ body: XSchema }, async (req, res, { body }) => …))`
 */
export function validated<S extends Shapes>(shapes: S, handler: ValidHandler<S>): RequestHandler[] {
  return [validate(shapes), (req, res, next) => handler(req, res, req.valid as Valid<S>, next)];
}

/**
 * Parses body, query and params with the shared schemas before the handler runs.
 * Parsed values land in `req.valid`; Express 5's `req.query` is read-only.
 */
export function validate(shapes: Shapes) {
  return (req: Request, _res: Response, next: NextFunction) => {
    const details: ErrorDetail[] = [];
    const valid: Record<string, unknown> = {};
    for (const part of ['params', 'query', 'body'] as const) {
      const schema = shapes[part];
      if (!schema) continue;
      const input = part === 'body' ? (req.body ?? {}) : req[part];
      const parsed = schema.safeParse(input);
      if (parsed.success) valid[part] = parsed.data;
      else details.push(...zodDetails(parsed.error, part === 'body' ? undefined : part));
    }
    if (details.length) {
      const summary = details.map((d) => `${d.path || 'input'}: ${d.message}`).join(' ');
      return next(notFoundForBadId(shapes, details) ?? new HttpError(400, 'validation_failed', `Check ${details.length === 1 ? 'this field' : 'these fields'}. ${summary}`, details));
    }
    req.valid = valid;
    next();
  };
}

// A malformed id in the path names no record: answer it as a 404, not a field error.
function notFoundForBadId(shapes: Shapes, details: ErrorDetail[]): HttpError | undefined {
  if (shapes.params && details.every((d) => d.path.startsWith('params')))
    return new HttpError(404, 'not_found', `Nothing is at that address. ${details.map((d) => d.message).join(' ')}`, details);
  return undefined;
}
