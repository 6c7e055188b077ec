// @vitest-environment jsdom
import { cleanup, fireEvent, screen, waitFor, within } from '@testing-library/react';
import { afterEach, describe, expect, it } from 'vitest';
import { PlanBoardRoute } from '../../src/features/plan/routes/plan-board';
import { failOnConsoleError, ids, mockFetch, planAnswer, quaySite, renderAt, user } from './plan-board-support';

afterEach(cleanup);
failOnConsoleError();

const PATH = `/plan?site=${ids.quay}&from=2026-12-07`;
const board = (role: 'manager' | 'technician' = 'manager') => renderAt(PATH, '/plan', <PlanBoardRoute />, user(role));
const cell = (rowId: string, day: string) => screen.getByTestId(`cell-${rowId}|${day}`);
const text = (el: HTMLElement | null) => (el?.textContent ?? '').replace(/\s+/g, ' ');
const blockNames = (el: HTMLElement) => within(el).queryAllByRole('button').map((b) => b.getAttribute('aria-label'));

describe('plan board', () => {
  it('draws each visit as a block in its bay and day, in time order, with its work, marks and the day’s load', async () => {
    const calls = mockFetch({ 'GET /api/sites': { body: { items: [quaySite] } }, 'GET /api/plan': { body: planAnswer() } });
    board();
    // Europe/London is on UTC+0 in December (the IANA time zone database, as Intl reads it), so 09:00Z is 09:00 at the site.
    const a = await screen.findByRole('button', { name: 'Visit SM-07 Tue 8 Dec 09:00, Bay 1' });
    expect(calls.find((c) => c.url.startsWith('/api/plan'))?.url).toBe(`/api/plan?site=${ids.quay}&from=2026-12-07&to=2026-12-20`);
    // Given out of order (09:00, 13:00, 08:00), shown earliest first.
    expect(blockNames(cell(ids.bay1, '2026-12-08'))).toEqual(['Visit SM-11 Tue 8 Dec 08:00, Bay 1', 'Visit SM-07 Tue 8 Dec 09:00, Bay 1', 'Visit SM-03 Tue 8 Dec 13:00, Bay 1']);
    expect(blockNames(cell(ids.bay2, '2026-12-08'))).toEqual([]);
    expect(text(a)).toContain('09:00–10:30');
    expect(text(a)).toContain('Strider 125');
    expect(text(a)).toContain('Brake fluid change · 30 min (safety-critical)');
    expect(text(a)).toContain('1 h 30 min in all · safety-critical work');
    expect(text(screen.getByRole('button', { name: 'Visit SM-03 Tue 8 Dec 13:00, Bay 1' }))).toContain('Pinned');
    expect(text(screen.getByTestId('capacity-2026-12-08'))).toContain('4 h of 8 h planned');
    expect(text(screen.getByTestId('capacity-2026-12-09'))).toContain('Workshop closed or nobody working');
    const unplaced = screen.getByTestId('unplaced');
    expect(text(unplaced)).toContain('Not placed yet (1)');
    expect(text(unplaced)).toContain('No bay free at Quay Street before 11 Dec; 3 h short.');
    expect(text(unplaced)).toContain('Plan it at Airfield, or add overtime on Sat 12 Dec.');
    expect(screen.getByRole('button', { name: 'Re-plan now' })).toBeTruthy();
  });

  it('by technician, puts the same visits in their technicians’ rows', async () => {
    mockFetch({ 'GET /api/sites': { body: { items: [quaySite] } }, 'GET /api/plan': { body: planAnswer() } });
    board();
    await screen.findByRole('button', { name: 'Visit SM-07 Tue 8 Dec 09:00, Bay 1' });
    fireEvent.click(screen.getByLabelText('By technician'));
    await waitFor(() => expect(screen.queryByTestId(`cell-${ids.tomasz}|2026-12-08`)).not.toBeNull());
    expect(blockNames(cell(ids.tomasz, '2026-12-08'))).toEqual(['Visit SM-07 Tue 8 Dec 09:00, Bay 1', 'Visit SM-03 Tue 8 Dec 13:00, Bay 1']);
    expect(blockNames(cell(ids.priya, '2026-12-08'))).toEqual(['Visit SM-11 Tue 8 Dec 08:00, Bay 1']);
  });

  it('shows the selected visit’s reasons, due dates and when its bike is needed', async () => {
    mockFetch({ 'GET /api/sites': { body: { items: [quaySite] } }, 'GET /api/plan': { body: planAnswer() } });
    board();
    fireEvent.click(await screen.findByRole('button', { name: 'Visit SM-07 Tue 8 Dec 09:00, Bay 1' }));
    const detail = screen.getByTestId('visit-detail');
    expect(text(detail)).toContain('Brake fluid falls due on 9 Dec: safety-critical work goes first.');
    expect(text(detail)).toContain('due 9 Dec 2026 · 30 min');
    expect(text(detail)).toContain('Latest day: 9 Dec 2026');
    expect(text(within(detail).getByRole('list', { name: 'Bookings around the visit of SM-07' }))).toContain('Tue 8 Dec 11:00 – Tue 8 Dec 17:00: hire “Coast ride” (this bike)');
    // The bike's own hire on the 8th in the day's head; the Breeze 125 lesson is another model's.
    expect(text(screen.getByTestId('needed-2026-12-08'))).toContain('11:00–17:00 Hire: Coast ride');
    expect(screen.queryByTestId('needed-2026-12-09')).toBeNull();
  });

  it('for a technician, shows the plan without moving or re-planning', async () => {
    mockFetch({ 'GET /api/sites': { body: { items: [quaySite] } }, 'GET /api/plan': { body: planAnswer() } });
    board('technician');
    fireEvent.click(await screen.findByRole('button', { name: 'Visit SM-07 Tue 8 Dec 09:00, Bay 1' }));
    expect(screen.queryByRole('button', { name: 'Re-plan now' })).toBeNull();
    expect(screen.queryByRole('button', { name: 'Move…' })).toBeNull();
    expect(screen.getByText(/A manager moves visits; you can look./)).toBeTruthy();
  });

  it('a refused move says why in words and leaves the visit where it was', async () => {
    const refusal = 'Bay 2 is taken by SM-03 from 09:00 to 10:00 on Wed 9 Dec. Pick another bay or time.';
    const calls = mockFetch({
      'GET /api/sites': { body: { items: [quaySite] } },
      'GET /api/plan': { body: planAnswer() },
      [`PATCH /api/plan/visits/${ids.visitA}`]: { status: 409, body: { error: { code: 'conflict', message: refusal } } },
    });
    board();
    fireEvent.click(await screen.findByRole('button', { name: 'Visit SM-07 Tue 8 Dec 09:00, Bay 1' }));
    fireEvent.click(screen.getByRole('button', { name: 'Move…' }));
    const form = screen.getByRole('form', { name: 'Move visit SM-07' });
    fireEvent.change(within(form).getByLabelText('Day'), { target: { value: '2026-12-09' } });
    fireEvent.change(within(form).getByLabelText('Bay'), { target: { value: ids.bay2 } });
    fireEvent.click(within(form).getByRole('button', { name: 'Move visit' }));
    expect(text(await within(form).findByRole('alert'))).toContain(refusal);
    const patch = calls.find((c) => c.method === 'PATCH');
    expect(patch?.body).toEqual({ start: '2026-12-09T09:00:00.000Z', bayId: ids.bay2, technicianId: ids.tomasz });
    // Still in Bay 1 on the 8th, and the plan was not fetched again.
    expect(blockNames(cell(ids.bay1, '2026-12-08'))).toContain('Visit SM-07 Tue 8 Dec 09:00, Bay 1');
    expect(blockNames(cell(ids.bay2, '2026-12-09'))).toEqual([]);
    expect(calls.filter((c) => c.url.startsWith('/api/plan?'))).toHaveLength(1);
  });

  it('an accepted move fetches the plan again', async () => {
    const moved = planAnswer();
    moved.visits[0] = { ...moved.visits[0], start: '2026-12-09T09:00:00.000Z', end: '2026-12-09T10:30:00.000Z', bayId: ids.bay2, bayName: 'Bay 2', pinned: true };
    let served = 0;
    const calls = mockFetch({
      'GET /api/sites': { body: { items: [quaySite] } },
      'GET /api/plan': () => ({ body: served++ === 0 ? planAnswer() : moved }),
      [`PATCH /api/plan/visits/${ids.visitA}`]: { body: { visit: moved.visits[0] } },
    });
    board();
    fireEvent.click(await screen.findByRole('button', { name: 'Visit SM-07 Tue 8 Dec 09:00, Bay 1' }));
    fireEvent.click(screen.getByRole('button', { name: 'Move…' }));
    const form = screen.getByRole('form', { name: 'Move visit SM-07' });
    fireEvent.change(within(form).getByLabelText('Day'), { target: { value: '2026-12-09' } });
    fireEvent.change(within(form).getByLabelText('Bay'), { target: { value: ids.bay2 } });
    fireEvent.click(within(form).getByRole('button', { name: 'Move visit' }));
    expect(await screen.findByRole('button', { name: 'Visit SM-07 Wed 9 Dec 09:00, Bay 2' })).toBeTruthy();
    expect(calls.filter((c) => c.url.startsWith('/api/plan?'))).toHaveLength(2);
  });
});

describe('plan board: dragging', () => {
  const days = ['2026-12-07', '2026-12-08', '2026-12-09', '2026-12-10'];
  const rows = [ids.bay1, ids.bay2];
  let restore: (() => void) | null = null;
  afterEach(() => restore?.());

  // jsdom lays nothing out: give each day cell a 200 × 100 px box in a grid, and each block its cell's box less a margin.
  function layOut() {
    const original = Element.prototype.getBoundingClientRect;
    Element.prototype.getBoundingClientRect = function (this: Element) {
      const el = this.closest('[data-testid^="cell-"]');
      const m = el && /^cell-(.+)\|(.+)$/.exec(el.getAttribute('data-testid')!);
      if (!m) return original.call(this);
      const x = 100 + days.indexOf(m[2]) * 200;
      const y = 100 + rows.indexOf(m[1]) * 100;
      const inset = el === this ? 0 : 10;
      return new DOMRect(x + inset, y + inset, 200 - 2 * inset, 100 - 2 * inset);
    };
    restore = () => (Element.prototype.getBoundingClientRect = original);
  }

  const press = async (code: string, times = 1) => {
    for (let i = 0; i < times; i++) {
      fireEvent.keyDown(document.activeElement ?? document, { code });
      await new Promise((r) => setTimeout(r, 0));
    }
  };

  it('dropping on another day and bay asks for the same time of day there; a refusal is shown and the block stays', async () => {
    layOut();
    const refusal = 'Tomasz Reed is not working on Wed 9 Dec before 12:00. Pick a time after 12:00 or another technician.';
    const calls = mockFetch({
      'GET /api/sites': { body: { items: [quaySite] } },
      'GET /api/plan': { body: planAnswer() },
      [`PATCH /api/plan/visits/${ids.visitA}`]: { status: 409, body: { error: { code: 'conflict', message: refusal } } },
    });
    board();
    const block = await screen.findByRole('button', { name: 'Visit SM-07 Tue 8 Dec 09:00, Bay 1' });
    block.focus();
    await press('Space');
    await press('ArrowRight', 8); // 25 px a press: one 200 px day to the right
    await press('ArrowDown', 4); // one 100 px row down
    await press('Space');
    expect(text(await screen.findByTestId('move-refusal'))).toContain(refusal);
    expect(calls.find((c) => c.method === 'PATCH')?.body).toEqual({ start: '2026-12-09T09:00:00.000Z', bayId: ids.bay2, technicianId: ids.tomasz });
    expect(blockNames(cell(ids.bay1, '2026-12-08'))).toContain('Visit SM-07 Tue 8 Dec 09:00, Bay 1');
    expect(blockNames(cell(ids.bay2, '2026-12-09'))).toEqual([]);
    expect(calls.filter((c) => c.url.startsWith('/api/plan?'))).toHaveLength(1);
  });
});
