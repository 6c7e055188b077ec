import type { ErrorCode, ErrorDetail } from '../shared/errors';

/** An expected refusal: becomes `{ error: { code, message, details } }` with its status. */
export class HttpError extends Error {
  constructor(
    readonly status: number,
    readonly code: ErrorCode,
    message: string,
    readonly details?: ErrorDetail[],
  ) {
    super(message);
  }
}

export const notFound = (what: string) => new HttpError(404, 'not_found', `${what} was not found. It may have been removed, or the link is wrong.`);
export const forbidden = (message = 'Your role does not allow this. Ask a manager or an administrator.') =>
  new HttpError(403, 'forbidden', message);
export const conflict = (message: string, details?: ErrorDetail[]) => new HttpError(409, 'conflict', message, details);
export const badRequest = (message: string, details?: ErrorDetail[]) =>
  new HttpError(400, 'validation_failed', message, details);
