// @vitest-environment jsdom
import { cleanup, fireEvent, screen, waitFor } from '@testing-library/react';
import { afterEach, describe, expect, it } from 'vitest';
import { SignOffForm } from '../../src/features/tasks/components/sign-off-form';
import type { Task } from '../../shared/schemas/tasks';
import type { TaskPart } from '../../shared/schemas/parts';
import { failOnConsoleError, ids, mockFetch, renderAt, user } from './plan-board-support';

afterEach(() => {
  cleanup();
  localStorage.clear();
});
failOnConsoleError();

const taskId = '00000000-0000-4000-8000-000000000301';
const oil = '00000000-0000-4000-8000-000000000302';
const filter = '00000000-0000-4000-8000-000000000303';
const task: Task = {
  id: taskId, bikeId: '00000000-0000-4000-8000-000000000304', fleetNumber: 'SM-10', siteId: ids.quay, siteName: 'Quay Street', modelName: 'Pathfinder 250',
  itemId: '00000000-0000-4000-8000-000000000305', item: 'Engine oil and filter', category: 'oil', safetyCritical: false, dueDate: '2026-12-04', bikeStatus: 'in_workshop',
  assignee: null, status: 'in_progress', origin: 'due', estimatedMinutes: 30, raisedAt: '2026-12-01T08:00:00.000Z', startedAt: '2026-12-04T08:00:00.000Z', closedAt: null, version: 3,
};
const parts: TaskPart[] = [
  { partId: oil, partNumber: 'SL-OIL-1040', name: 'Engine oil 10W-40', unit: 'litre', usual: 1.6, share: 1, suggested: 1.6, onHand: 36 },
  { partId: filter, partNumber: 'SL-FLT-250', name: 'Oil filter, 250–400 cc', unit: 'each', usual: 1, share: 1, suggested: 1, onHand: 0 },
];

function open(close: Parameters<typeof mockFetch>[0][string]) {
  const calls = mockFetch({
    [`GET /api/tasks/${taskId}`]: { body: { task, readings: [], parts } },
    [`POST /api/tasks/${taskId}/close`]: close,
  });
  renderAt('/tasks', '/tasks', <SignOffForm task={task} onCancel={() => {}} onReload={() => {}} />, user('technician', 'Tomasz Reed'));
  return calls;
}

describe('signing off with the parts used', () => {
  it('pre-fills what every such service uses, sends what was typed, and keeps it when the shelf cannot cover it', async () => {
    const message = 'Only 0 pieces of Oil filter, 250–400 cc on hand.';
    const calls = open({ status: 400, body: { error: { code: 'bad_request', message: `${message} Change what was used, or book the delivery or a stock-take on the stock page first.`, details: [{ path: 'parts', message }] } } });
    const oilBox = (await screen.findByLabelText(/Engine oil 10W-40/)) as HTMLInputElement;
    expect(oilBox.value).toBe('1.6');
    expect(screen.getByText(/usually 1\.6 L · 36 L on the shelf/)).toBeTruthy();
    fireEvent.change(oilBox, { target: { value: '1,1' } });
    fireEvent.click(screen.getByRole('button', { name: 'Sign off as done' }));
    await waitFor(() => expect(calls.some((c) => c.method === 'POST')).toBe(true));
    const sent = calls.find((c) => c.method === 'POST')!.body as { version: number; parts: unknown };
    expect(sent.version).toBe(3);
    // A comma is read as the decimal point, as a workshop in Europe types it.
    expect(sent.parts).toEqual([{ partId: oil, quantity: 1.1, unit: 'litre' }, { partId: filter, quantity: 1, unit: 'each' }]);
    expect((await screen.findAllByRole('alert')).some((a) => a.textContent?.includes(message))).toBe(true);
    expect((screen.getByLabelText(/Engine oil 10W-40/) as HTMLInputElement).value).toBe('1,1');
  });

  it('refuses a figure that is not a number before sending anything', async () => {
    const calls = open({ body: {} });
    fireEvent.change(await screen.findByLabelText(/Oil filter/), { target: { value: 'one' } });
    fireEvent.click(screen.getByRole('button', { name: 'Sign off as done' }));
    expect(await screen.findByText(/Type what was used as a number/)).toBeTruthy();
    expect(calls.some((c) => c.method === 'POST')).toBe(false);
  });
});
