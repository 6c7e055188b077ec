import { ApiError } from '../../lib/api-client';
import type { ValveReadingInput } from '../../../shared/schemas/valves';

export interface SignOffErrors {
  status: number;
  message: string;
  /** Messages per valve, shown on that valve's row. */
  byValve: Map<string, string[]>;
  /** Messages for the card's own fields: date, notes, override.reason. */
  fields: Record<string, string>;
  /** Someone else changed or closed the task: reload, keep the readings. */
  stale: boolean;
}

/**
 * The server names a valve by its id ("readings.c2-exhaust-1.asLeftMm") when it checks the
 * readings, and by its place in the list ("readings.3.asFound") when the shape is wrong.
 */
export function signOffErrors(err: unknown, sent: ValveReadingInput[]): SignOffErrors {
  const e = err instanceof ApiError ? err : new ApiError(0, 'internal', (err as Error).message);
  const byValve = new Map<string, string[]>();
  const fields: Record<string, string> = {};
  for (const d of e.details) {
    const m = /^readings\.([^.]+)/.exec(d.path);
    const id = m ? (/^\d+$/.test(m[1]) ? sent[Number(m[1])]?.valveId : m[1]) : undefined;
    if (id) byValve.set(id, [...(byValve.get(id) ?? []), d.message]);
    else fields[d.path || 'card'] = d.message;
  }
  return { status: e.status, message: e.message, byValve, fields, stale: e.status === 409 && e.details.length === 0 };
}
