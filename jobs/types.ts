import type { Transporter } from 'nodemailer';
import type { Db } from '../server/db/client';

/** What every job needs; passed in so a job runs the same from cron, the admin page, the CLI or a test. */
export interface JobDeps {
  db: Db;
  now: () => Date;
  mail: { transport: () => Transporter; from: string };
  publicUrl: string;
  log: (line: string) => void;
}

export interface JobResult {
  summary: string;
  [key: string]: unknown;
}

export type Job = (deps: JobDeps) => Promise<JobResult>;
