import { Router } from 'express';
import { z } from 'zod';
import type { AppContext } from '../app';
import { requireRoleOrJobToken } from '../middleware/auth';
import { hasJobToken } from '../middleware/csrf';
import { validated } from '../middleware/validate';
import { JOBS, JOB_NAMES, type JobName } from '../../jobs/registry';

const JobParams = z.object({ name: z.enum(JOB_NAMES as [JobName, ...JobName[]], { message: `Jobs are: ${JOB_NAMES.join(', ')}.` }) });

export function adminJobRoutes(ctx: AppContext) {
  const r = Router();
  // Runs a job now and answers with what it did; the command-line job calls this when the server holds the data.
  r.post('/:name/run', requireRoleOrJobToken((req) => hasJobToken(req, ctx.jobToken), 'admin'), ...validated({ params: JobParams }, async (req, res, v) => {
    const { name } = v.params;
    res.json({ job: name, result: await JOBS[name](ctx.jobDeps()) });
  }));
  return r;
}
