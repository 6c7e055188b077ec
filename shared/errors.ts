/** The error codes the API may send, in `{ error: { code, message, details? } }`. */
export const ERROR_CODES = [
  'validation_failed',
  'not_signed_in',
  'forbidden',
  'not_found',
  'conflict',
  'too_many_requests',
  'csrf_failed',
  'payload_too_large',
  'needs_confirmation',
  'key_reused',
  'in_progress',
  'setup_required',
  'unavailable',
  'internal',
] as const;
export type ErrorCode = (typeof ERROR_CODES)[number];

export interface ErrorDetail {
  /** Dotted path of the field, e.g. "vin" or "defect.text". */
  path: string;
  message: string;
}

export interface ApiErrorBody {
  error: { code: ErrorCode; message: string; details?: ErrorDetail[] };
}
