import { resolve } from 'node:path';
import { parseArgs } from 'node:util';
import { londonToday } from '../server/demo/seed';

export const BENCH_DIR = resolve(import.meta.dirname);
export const DATA_ROOT = resolve(BENCH_DIR, '.data');
export const DEMO_PASSWORD = 'saltmarsh-demo-26';
export const MANAGER_EMAIL = 'imogen@saltmarsh.test';
export const SIZES = [200, 2000, 20000] as const;

export interface BenchArgs {
  bikes: number;
  full: boolean;
  seed: string;
  today: string;
  reset: boolean;
  databaseUrl?: string;
  skipClient: boolean;
}

/** Command-line options shared by generate.ts and run.ts. */
export function benchArgs(argv = process.argv.slice(2)): BenchArgs {
  const { values } = parseArgs({
    args: argv,
    options: {
      bikes: { type: 'string', default: '2000' },
      full: { type: 'boolean', default: false },
      seed: { type: 'string', default: 'lashline-bench' },
      today: { type: 'string' },
      reset: { type: 'boolean', default: false },
      'skip-client': { type: 'boolean', default: false },
    },
    strict: true,
  });
  const bikes = Number(values.bikes);
  if (!Number.isInteger(bikes) || bikes < 10 || bikes > 50_000) throw new Error(`--bikes takes a whole number from 10 to 50000 (200, 2000 or 20000), got ${values.bikes}`);
  const today = values.today ?? londonToday();
  if (!/^\d{4}-\d{2}-\d{2}$/.test(today)) throw new Error(`--today takes a date as YYYY-MM-DD, got ${today}`);
  return {
    bikes,
    full: values.full,
    seed: values.seed,
    today,
    reset: values.reset,
    databaseUrl: process.env.DATABASE_URL || undefined,
    skipClient: values['skip-client'],
  };
}

export const dataDirFor = (bikes: number) => resolve(DATA_ROOT, `fleet-${bikes}`);
