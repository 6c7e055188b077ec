import { Router } from 'express';
import type { AppContext } from '../app';
import { currentUser, requireRole, signedIn } from '../middleware/auth';
import { validated } from '../middleware/validate';
import { IdParamsSchema } from '../../shared/schemas/common';
import { AssignSchema, CloseTaskSchema, TaskListQuerySchema } from '../../shared/schemas/tasks';
import { assignableTechnicians, assignTask, closeTask, getTask, listTasks, startTask } from '../services/tasks';
import { notFound } from '../http-error';
import { eq } from 'drizzle-orm';
import { serviceTasks } from '../db/schema';
import { recordReadings, templatesFor } from '../services/task-readings';
import { CloseValveTaskSchema, ValveDraftSchema } from '../../shared/schemas/valves';
import { closeValveTask, saveDraft, valveCard } from '../services/valve-task';
import { partsForItem } from '../services/parts';

export function taskRoutes(ctx: AppContext) {
  const r = Router();
  const db = ctx.database.db;

  r.get('/', requireRole('technician', 'manager', 'admin'), ...validated({ query: TaskListQuerySchema }, async (req, res, v) => {
    res.json({ items: await listTasks(db, currentUser(req), v.query) });
  }));

  r.get('/assignees', requireRole('manager', 'admin'), async (req, res) => {
    res.json({ items: await assignableTechnicians(db, currentUser(req)) });
  });

  r.get('/:id', signedIn(), ...validated({ params: IdParamsSchema }, async (req, res, v) => {
    const task = await getTask(db, currentUser(req), v.params.id);
    if (!task) throw notFound('That task');
    res.json({ task, readings: (await templatesFor(db, [task.itemId])).get(task.itemId) ?? [], parts: await partsForItem(db, task.siteId, task.itemId) });
  }));

  r.post('/:id/assign', requireRole('manager', 'admin'), ...validated({ params: IdParamsSchema, body: AssignSchema }, async (req, res, v) => {
    await assignTask(db, currentUser(req), v.params.id, v.body.assigneeId);
    res.json({ task: await getTask(db, currentUser(req), v.params.id) });
  }));

  r.post('/:id/start', requireRole('technician', 'manager'), ...validated({ params: IdParamsSchema }, async (req, res, v) => {
    await startTask(db, currentUser(req), v.params.id, ctx.now());
    res.json({ task: await getTask(db, currentUser(req), v.params.id) });
  }));

  r.post('/:id/close', requireRole('technician', 'manager'), ...validated({ params: IdParamsSchema, body: CloseTaskSchema }, async (req, res, v) => {
    const user = currentUser(req);
    const body = v.body;
    let grounded = false;
    await closeTask(db, user, v.params.id, body, ctx.now(), async (tx, c) => {
      const [t] = await tx.select({ itemId: serviceTasks.serviceItemId }).from(serviceTasks).where(eq(serviceTasks.id, c.taskId));
      ({ grounded } = await recordReadings(tx, { ...c, serviceItemId: t.itemId }, body.readings, user, ctx.now()));
    });
    res.json({ task: await getTask(db, user, v.params.id), grounded });
  }));
  r.get('/:id/valve-card', requireRole('technician', 'manager'), ...validated({ params: IdParamsSchema }, async (req, res, v) => {
    res.json(await valveCard(db, currentUser(req), v.params.id));
  }));

  r.put('/:id/draft', requireRole('technician', 'manager'), ...validated({ params: IdParamsSchema, body: ValveDraftSchema }, async (req, res, v) => {
    await saveDraft(db, currentUser(req), v.params.id, v.body);
    res.status(204).end();
  }));

  r.post('/:id/valve-close', requireRole('technician', 'manager'), ...validated({ params: IdParamsSchema, body: CloseValveTaskSchema }, async (req, res, v) => {
    await closeValveTask(db, currentUser(req), v.params.id, v.body, ctx.now());
    res.json({ task: await getTask(db, currentUser(req), v.params.id) });
  }));
  return r;
}
