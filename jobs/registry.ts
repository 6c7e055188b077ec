import type { Job } from './types';
import { run as dueScan } from './due-scan';
import { run as weeklyDigest } from './weekly-digest';
import { run as deliverMail } from './deliver-mail';
import { run as bookingSync } from './booking-sync';

export const JOBS = { 'due-scan': dueScan, 'weekly-digest': weeklyDigest, 'deliver-mail': deliverMail, 'booking-sync': bookingSync } satisfies Record<string, Job>;
export type JobName = keyof typeof JOBS;
export const JOB_NAMES = Object.keys(JOBS) as JobName[];
export const isJobName = (s: string): s is JobName => s in JOBS;
