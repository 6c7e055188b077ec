import { describeLimit, outsideLimits } from '../../../../shared/domain/limits';
import type { ReadingTemplate, ReadingValue } from '../../../../shared/schemas/tasks';

/** How a typed reading stands against its template, before anything is sent. */
export type Judgement =
  | { state: 'empty' }
  | { state: 'bad' }
  | { state: 'ok' }
  /** Outside a limit that is not safety-critical: recorded and flagged, the bike stays in service. */
  | { state: 'outside' }
  /** Outside a safety-critical limit (or a safety check not done): signing off grounds the bike. */
  | { state: 'grounds' };

/** Typed text as a reading: a comma works as the decimal point (gloves, foreign keyboards). */
export const readNumber = (raw: string) => Number(raw.trim().replace(',', '.'));

export function judge(t: ReadingTemplate, raw: string | undefined): Judgement {
  const v = (raw ?? '').trim();
  if (v === '') return { state: 'empty' };
  if (t.kind === 'date') return { state: 'ok' };
  if (t.kind === 'check') return v === 'done' ? { state: 'ok' } : { state: t.safetyCritical ? 'grounds' : 'outside' };
  const n = readNumber(v);
  if (!Number.isFinite(n)) return { state: 'bad' };
  if (!outsideLimits(n, t)) return { state: 'ok' };
  return { state: t.safetyCritical ? 'grounds' : 'outside' };
}

export const limitWords = (t: ReadingTemplate) => describeLimit(t, t.unit);

/** The value the server expects for a template, from what was typed. */
export function toReadingValue(t: ReadingTemplate, raw: string): ReadingValue {
  if (t.kind === 'measure') return { templateId: t.id, value: readNumber(raw) };
  if (t.kind === 'check') return { templateId: t.id, done: raw === 'done' };
  return { templateId: t.id, dateValue: raw };
}
