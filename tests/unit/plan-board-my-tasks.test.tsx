// @vitest-environment jsdom
import { cleanup, screen, within } from '@testing-library/react';
import { afterEach, describe, expect, it } from 'vitest';
import { TasksRoute } from '../../src/features/tasks/routes/tasks';
import type { Task } from '../../shared/schemas/tasks';
import { failOnConsoleError, ids, mockFetch, planAnswer, quaySite, renderAt, user } from './plan-board-support';

afterEach(cleanup);
failOnConsoleError();

function task(id: string, fleetNumber: string, item: string, dueDate: string): Task {
  return {
    id, bikeId: ids.sm07, fleetNumber, siteId: ids.quay, siteName: 'Quay Street', modelName: 'Strider 125', itemId: ids.booking1, item, category: 'general',
    safetyCritical: false, dueDate, bikeStatus: 'in_service', assignee: { id: ids.me, name: 'Tomasz Reed' }, status: 'open', origin: 'scan',
    estimatedMinutes: 30, raisedAt: '2026-12-01T06:00:00.000Z', startedAt: null, closedAt: null, version: 1,
  };
}

const tomasz = user('technician', 'Tomasz Reed');
const tasks = [task(ids.task1, 'SM-07', 'Valve clearance check', '2026-12-10'), task(ids.task3, 'SM-03', 'Chain adjust', '2026-12-12'), task(ids.task4, 'SM-11', 'Tyre check', '2026-12-08')];

describe('My tasks with today’s visits', () => {
  it('lists today’s visits first, in the order they are worked, each task linked to its card', async () => {
    // The server's day, given here out of time order: 09:00, 13:00, 08:00.
    const day = { date: '2026-12-08', visits: planAnswer().visits };
    mockFetch({ 'GET /api/sites': { body: { items: [quaySite] } }, 'GET /api/plan/my-day': { body: day }, 'GET /api/tasks': { body: { items: tasks } } });
    renderAt('/tasks', '/tasks', <TasksRoute />, tomasz);
    const list = await screen.findByRole('list', { name: 'Today’s visits in order' });
    const visits = within(list).getAllByRole('listitem').filter((li) => li.dataset.testid?.startsWith('my-visit-'));
    // Europe/London is UTC+0 in December (IANA time zone database via Intl): 08:00Z reads 08:00.
    expect(visits.map((v) => v.textContent?.match(/^\d\d:\d\d–\d\d:\d\d/)?.[0])).toEqual(['08:00–08:30', '09:00–10:30', '13:00–13:45']);
    expect(visits.map((v) => within(v).getAllByRole('link')[0].textContent)).toEqual(['SM-11', 'SM-07', 'SM-03']);
    expect(visits[1].textContent).toContain('Bay 1');
    const valve = within(visits[1]).getByRole('link', { name: 'Valve clearance check' });
    expect(valve.getAttribute('href')).toBe(`#task-${ids.task1}`);
    expect(document.getElementById(`task-${ids.task1}`)?.getAttribute('aria-label')).toBe('SM-07: Valve clearance check');
    // Brake fluid is in the visit but not on this technician's list: named, not linked.
    expect(within(visits[1]).queryByRole('link', { name: 'Brake fluid change' })).toBeNull();
    expect(visits[1].textContent).toContain('Brake fluid change');
    // Then the rest of the work as before, after the visits.
    const groups = screen.getByRole('heading', { name: /Today and overdue/ });
    expect(list.compareDocumentPosition(groups) & Node.DOCUMENT_POSITION_FOLLOWING).toBeTruthy();
    expect(screen.getAllByRole('article').map((a) => a.getAttribute('aria-label'))).toEqual(['SM-11: Tyre check', 'SM-07: Valve clearance check', 'SM-03: Chain adjust']);
  });

  it('says so when nothing is planned for today, and still lists the work', async () => {
    mockFetch({ 'GET /api/sites': { body: { items: [quaySite] } }, 'GET /api/plan/my-day': { body: { date: '2026-12-08', visits: [] } }, 'GET /api/tasks': { body: { items: tasks } } });
    renderAt('/tasks', '/tasks', <TasksRoute />, tomasz);
    expect(await screen.findByText('No visits planned for you today.')).toBeTruthy();
    expect(screen.getAllByRole('article')).toHaveLength(3);
  });

  it('shows everyone’s tasks to a manager without a day of visits', async () => {
    const calls = mockFetch({ 'GET /api/tasks': { body: { items: tasks } } });
    renderAt('/tasks', '/tasks', <TasksRoute />, user('manager'));
    expect(await screen.findAllByRole('article')).toHaveLength(3);
    expect(screen.queryByRole('heading', { name: /Today in the workshop/ })).toBeNull();
    expect(calls.some((c) => c.url.startsWith('/api/plan'))).toBe(false);
  });
});
