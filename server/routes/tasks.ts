import { Router } from 'express';
import type { AppContext } from '../app';
import { currentUser, requireRole, signedIn } from '../middleware/auth';
import { validate } from '../middleware/validate';
import { IdParamsSchema } from '../../shared/schemas/common';
import { AssignSchema, CloseTaskSchema, TaskListQuerySchema, type CloseTask, type TaskListQuery } from '../../shared/schemas/tasks';
import { assignableTechnicians, assignTask, closeTask, getTask, listTasks, startTask } from '../services/tasks';
import { notFound } from '../http-error';
import { eq } from 'drizzle-orm';
import { serviceTasks } from '../db/schema';
import { recordReadings, templatesFor } from '../services/task-readings';
import { CloseValveTaskSchema, ValveDraftSchema, type CloseValveTask } from '../../shared/schemas/valves';
import { closeValveTask, saveDraft, valveCard } from '../services/valve-task';
import { partsForItem } from '../services/parts';

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
    res.json({ task, readings: (await templatesFor(db, [task.itemId])).get(task.itemId) ?? [], parts: await partsForItem(db, task.siteId, task.itemId) });
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
    const user = currentUser(req);
    const body = req.valid.body as CloseTask;
    let grounded = false;
    await closeTask(db, user, id(req), body, ctx.now(), async (tx, c) => {
      const [t] = await tx.select({ itemId: serviceTasks.serviceItemId }).from(serviceTasks).where(eq(serviceTasks.id, c.taskId));
      ({ grounded } = await recordReadings(tx, { ...c, serviceItemId: t.itemId }, body.readings, user, ctx.now()));
    });
    res.json({ task: await getTask(db, user, id(req)), grounded });
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
