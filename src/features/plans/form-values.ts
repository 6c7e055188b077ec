import type { ZodError } from 'zod';

export type Errors = Record<string, string>;

/** Typed text as a number: blank is "not given" (null), a comma works as the decimal point. */
export function num(text: string): number | null {
  const t = text.trim().replace(',', '.');
  return t === '' ? null : Number(t);
}

/** A number as the form shows it again: blank for none. */
export const text = (v: number | null | undefined) => (v == null ? '' : String(v));

/**
 * One message per field, keyed by its dotted path (the same keys the server's 400 details use).
 * zod's own wording for a missing or non-numeric value is replaced by one that says what to type.
 */
export function fieldErrors(error: ZodError, typed: (path: string) => string | undefined): Errors {
  const out: Errors = {};
  for (const issue of error.issues) {
    const path = issue.path.join('.');
    if (out[path]) continue;
    if (issue.code === 'invalid_type' && issue.expected === 'int') out[path] = 'Use a whole number.';
    else if (issue.code === 'invalid_type') out[path] = typed(path)?.trim() ? 'Type a number, e.g. 0.15 or 6000.' : 'Fill this in.';
    else out[path] = issue.message;
  }
  return out;
}

/** Server details, keyed the same way, so they sit beside the same fields. */
export const detailErrors = (details: { path: string; message: string }[]): Errors => Object.fromEntries(details.map((d) => [d.path, d.message]));

/** A thickness or clearance in mm, with as many decimals as the trade writes (0.05, 0.025). */
export function mm(v: number | null | undefined) {
  if (v == null) return '—';
  const s = v.toFixed(3);
  return s.endsWith('0') ? v.toFixed(2) : s;
}

/** The typed text at a dotted path ("readings.0.min"), to word an error about it. */
export function typedAt(values: object, path: string): string | undefined {
  let at: unknown = values;
  for (const key of path.split('.')) at = at && typeof at === 'object' ? (at as Record<string, unknown>)[key] : undefined;
  return typeof at === 'string' ? at : undefined;
}
