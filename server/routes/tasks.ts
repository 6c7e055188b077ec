import { Router } from 'express';
import type { AppContext } from '../app';
import { currentUser, requireRole, signedIn } from '../middleware/auth';
import { validate } from '../middleware/validate';
import { IdParamsSchema } from '../../shared/schemas/common';
import { AssignSchema, CloseTaskSchema, TaskListQuerySchema, type CloseTask, type TaskListQuery } from '../../shared/schemas/tasks';
import { assignableTechnicians, assignTask, closeTask, getTask, listTasks, startTask } from '../services/tasks';
import { notFound } from '../http-error';
import { CloseValveTaskSchema, ValveDraftSchema, type CloseValveTask } from '../../shared/schemas/valves';
import { closeValveTask, saveDraft, valveCard } from '../services/valve-task';

export function taskRoutes(ctx: AppContext) {
  const r = Router();
  const db = ctx.database.db;
  const id = (req: { valid: { params?: unknown } }) => (req.valid.params as { id: string }).id;

  r.get('/', requireRole('technician', 'manager', 'admin'), validate({ query: TaskListQuerySchema }), async (req, res) => {
    res.json({ items: await listTasks(db, currentUser(req), req.valid.query as TaskListQuery) });
  });

  r.get('/assignees', requireRole('manager', 'admin'), async (req, res) => {
    res.json({ items: await assignableTechnicians(db, currentUser(req)) });
  });

  r.get('/:id', signedIn(), validate({ params: IdParamsSchema }), async (req, res) => {
    const task = await getTask(db, currentUser(req), id(req));
    if (!task) throw notFound('That task');
    res.json({ task });
  });

  r.post('/:id/assign', requireRole('manager', 'admin'), validate({ params: IdParamsSchema, body: AssignSchema }), async (req, res) => {
    await assignTask(db, currentUser(req), id(req), (req.valid.body as { assigneeId: string | null }).assigneeId);
    res.json({ task: await getTask(db, currentUser(req), id(req)) });
  });

  r.post('/:id/start', requireRole('technician', 'manager'), validate({ params: IdParamsSchema }), async (req, res) => {
    await startTask(db, currentUser(req), id(req), ctx.now());
    res.json({ task: await getTask(db, currentUser(req), id(req)) });
  });

  r.post('/:id/close', requireRole('technician', 'manager'), validate({ params: IdParamsSchema, body: CloseTaskSchema }), async (req, res) => {
    await closeTask(db, currentUser(req), id(req), req.valid.body as CloseTask, ctx.now());
    res.json({ task: await getTask(db, currentUser(req), id(req)) });
  });
  r.get('/:id/valve-card', requireRole('technician', 'manager'), validate({ params: IdParamsSchema }), async (req, res) => {
    res.json(await valveCard(db, currentUser(req), id(req)));
  });

  r.put('/:id/draft', requireRole('technician', 'manager'), validate({ params: IdParamsSchema, body: ValveDraftSchema }), async (req, res) => {
    await saveDraft(db, currentUser(req), id(req), req.valid.body);
    res.status(204).end();
  });

  r.post('/:id/valve-close', requireRole('technician', 'manager'), validate({ params: IdParamsSchema, body: CloseValveTaskSchema }), async (req, res) => {
    await closeValveTask(db, currentUser(req), id(req), req.valid.body as CloseValveTask, ctx.now());
    res.json({ task: await getTask(db, currentUser(req), id(req)) });
  });
  return r;
}
