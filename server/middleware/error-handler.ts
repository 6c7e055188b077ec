import type { NextFunction, Request, Response } from 'express';
import { ZodError } from 'zod';
import { HttpError } from '../http-error';
import { zodDetails } from './validate';
import type { ApiErrorBody } from '../../shared/errors';

export function apiNotFound(req: Request, _res: Response, next: NextFunction) {
  next(new HttpError(404, 'not_found', `There is no API route ${req.method} ${req.path}. Check the address.`));
}

interface BodyParserError {
  type?: string;
  status?: number;
}

export function errorHandler(log: (e: unknown, req: Request) => void) {
  return (err: unknown, req: Request, res: Response, _next: NextFunction) => {
    const send = (status: number, error: ApiErrorBody['error']) => {
      if (res.headersSent) return res.end();
      res.status(status).json({ error });
    };
    if (err instanceof HttpError)
      return send(err.status, { code: err.code, message: err.message, ...(err.details ? { details: err.details } : {}) });
    if (err instanceof ZodError)
      return send(400, { code: 'validation_failed', message: 'Some fields are not right.', details: zodDetails(err) });
    const bp = err as BodyParserError;
    if (bp?.type === 'entity.parse.failed')
      return send(400, { code: 'validation_failed', message: 'The request body is not valid JSON.' });
    if (bp?.type === 'entity.too.large' || bp?.status === 413)
      return send(413, { code: 'payload_too_large', message: 'The request is too large.' });
    if (bp?.status && bp.status >= 400 && bp.status < 500)
      return send(400, { code: 'validation_failed', message: 'The request could not be read.' });
    log(err, req);
    send(500, { code: 'internal', message: 'Something went wrong on our side. Nothing was saved; try again, and tell an administrator if it keeps happening.' });
  };
}
