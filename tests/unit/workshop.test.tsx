// @vitest-environment jsdom
import { cleanup, fireEvent, screen, within } from '@testing-library/react';
import { afterEach, describe, expect, it } from 'vitest';
import rrulePkg from 'rrule';
import { WorkshopRoute } from '../../src/features/workshop/routes/workshop';
import type { Capacity } from '../../shared/schemas/capacity';
import { failOnConsoleError, ids, mockFetch, renderAt, user } from './plan-board-support';

const { rrulestr } = rrulePkg;
afterEach(cleanup);
failOnConsoleError();

const capacity = (): Capacity => ({
  sites: [
    {
      id: ids.quay, name: 'Quay Street', timeZone: 'Europe/London',
      bays: [{ id: ids.bay1, name: 'Bay 1', position: 1 }, { id: ids.bay2, name: 'Bay 2', position: 2 }],
      hours: [1, 2, 3, 4, 5, 6].map((weekday) => ({ weekday, opensAt: '08:00', closesAt: '17:30' })),
      technicians: [
        {
          id: ids.tomasz, name: 'Tomasz Reed',
          patterns: [{ id: ids.visitA, rrule: 'FREQ=WEEKLY;BYDAY=MO,TU,WE,TH,FR', startsOn: '2026-11-09', endsOn: null, startTime: '08:00', endTime: '16:30', label: 'Weekdays', words: 'every weekday, 08:00–16:30' }],
          timeOff: [{ id: ids.visitB, firstDay: '2026-12-24', lastDay: '2026-12-24', reason: 'Christmas Eve' }],
        },
      ],
    },
  ],
});
const open = () => renderAt('/workshop', '/workshop', <WorkshopRoute />, user('manager'));

describe('workshop screen', () => {
  it('shows the bays, the opening hours and each technician\'s patterns in words and time off', async () => {
    mockFetch({ 'GET /api/capacity': { body: capacity() } });
    open();
    expect(await screen.findByLabelText('Bay 2 name')).toHaveProperty('value', 'Bay 2');
    expect(screen.getByRole('checkbox', { name: 'Sunday' })).toHaveProperty('checked', false);
    expect(screen.getByLabelText('Saturday closes')).toHaveProperty('value', '17:30');
    const card = screen.getByRole('article', { name: 'Tomasz Reed' });
    expect(card.textContent).toContain('Weekdays: every weekday, 08:00–16:30');
    expect(card.textContent).toContain('2026-12-24 · Christmas Eve');
  });

  it('writes the editor\'s choices as an RRULE: Monday and Wednesday every other week', async () => {
    const calls = mockFetch({ 'GET /api/capacity': { body: capacity() }, 'POST /api/work-patterns': { status: 201, body: { pattern: capacity().sites[0].technicians[0].patterns[0] } } });
    open();
    fireEvent.click(await screen.findByRole('button', { name: '+ Add a working pattern' }));
    const form = screen.getByRole('button', { name: 'Add pattern' }).closest('form')!;
    for (const d of ['Tuesday', 'Thursday', 'Friday']) fireEvent.click(within(form).getByRole('checkbox', { name: d }));
    fireEvent.click(within(form).getByRole('radio', { name: 'Every other week' }));
    fireEvent.change(within(form).getByLabelText('From'), { target: { value: '2026-12-07' } });
    expect(form.textContent).toContain('In words: every 2 weeks on Monday, Wednesday, 08:00–16:30');
    fireEvent.click(within(form).getByRole('button', { name: 'Add pattern' }));
    await screen.findByRole('button', { name: '+ Add a working pattern' });
    const post = calls.find((c) => c.method === 'POST' && c.url === '/api/work-patterns')!;
    expect(post.body).toMatchObject({ siteId: ids.quay, userId: ids.tomasz, startsOn: '2026-12-07', startTime: '08:00', endTime: '16:30', endsOn: null });
    // RFC 5545 read back by rrule: weekdays 0 = Monday, 2 = Wednesday, every second week.
    const rule = rrulestr(`RRULE:${(post.body as { rrule: string }).rrule}`);
    expect([...(rule.options.byweekday ?? [])].sort()).toEqual([0, 2]);
    expect(rule.options.interval).toBe(2);
  });

  it('says in the server\'s words why a bay cannot be removed', async () => {
    const message = 'Bay 2 has 3 visits planned from Tue 8 Dec. Move them first.';
    mockFetch({ 'GET /api/capacity': { body: capacity() }, [`DELETE /api/bays/${ids.bay2}`]: { status: 409, body: { error: { code: 'conflict', message } } } });
    open();
    fireEvent.click(await screen.findByRole('button', { name: 'Remove Bay 2' }));
    expect((await screen.findByRole('alert')).textContent).toContain(message);
  });
});
