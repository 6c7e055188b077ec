import { z } from 'zod';

export const MAX_NAME = 120;
export const MAX_TEXT = 2000;

export const IdSchema = z.uuid({ message: 'Must be an id as given by Lashline (a UUID).' });
export const IdParamsSchema = z.object({ id: IdSchema });

export const IsoDateSchema = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}$/, 'Use a date as YYYY-MM-DD, e.g. 2026-03-01.')
  .refine((s) => {
    const d = new Date(`${s}T00:00:00Z`);
    return !Number.isNaN(d.getTime()) && d.toISOString().slice(0, 10) === s;
  }, 'That date does not exist on the calendar.');

export const OdometerUnitSchema = z.enum(['km', 'mi']);
