// @vitest-environment jsdom
import { cleanup, fireEvent, screen, waitFor, within } from '@testing-library/react';
import { afterEach, describe, expect, it } from 'vitest';
import { TZDate } from '@date-fns/tz';
import { BookingsRoute } from '../../src/features/bookings/routes/bookings';
import type { Booking, Feed } from '../../shared/schemas/bookings';
import { failOnConsoleError, ids, mockFetch, quaySite, renderAt, user } from './plan-board-support';

afterEach(cleanup);
failOnConsoleError();

const strider = {
  id: ids.booking2, name: 'Strider 125', cylinders: 1, intakeValvesPerCylinder: 1, exhaustValvesPerCylinder: 1, adjuster: 'screw-and-locknut' as const,
  intakeMinMm: 0.05, intakeMaxMm: 0.09, exhaustMinMm: 0.08, exhaustMaxMm: 0.12, shimMinMm: null, shimMaxMm: null, shimStepMm: null,
};
const sm07 = {
  id: ids.sm07, fleetNumber: 'SM-07', vin: null, registration: null, model: { id: ids.booking2, name: 'Strider 125' }, site: { id: ids.quay, name: 'Quay Street' },
  status: 'in_service' as const, statusReason: null, odometerUnit: 'km' as const, inServiceDate: '2025-03-01', inServiceOdometer: 0, latestOdometer: 100, latestOdometerKm: 100, latestReadingDate: '2026-12-01',
};
const booking = (over: Partial<Booking>): Booking => ({
  id: ids.booking1, siteId: ids.quay, siteName: 'Quay Street', timeZone: 'Europe/London', kind: 'hire', bikeId: ids.sm07, fleetNumber: 'SM-07', modelId: ids.booking2, modelName: 'Strider 125',
  quantity: 1, startAt: '2026-12-12T09:00:00.000Z', endAt: '2026-12-12T17:00:00.000Z', rrule: null, ruleText: null, title: 'Day hire', source: 'manual', feedId: null, feedName: null,
  occurrences: [{ start: '2026-12-12T09:00:00.000Z', end: '2026-12-12T17:00:00.000Z' }], ...over,
});
const feed: Feed = {
  id: ids.visitA, siteId: ids.quay, siteName: 'Quay Street', name: 'Online hires', url: 'https://calendar.example.test/hires.ics', kind: 'hire', defaultModelId: null, defaultModelName: null,
  lastAttemptAt: '2026-12-03T10:15:00.000Z', lastGoodAt: '2026-12-03T09:45:00.000Z', lastError: '404 Not Found', eventCount: 42, skipped: 0,
  status: 'Could not load at 10:15: 404 Not Found. Showing the copy from 09:45, 42 events.',
};
const items = [
  booking({}),
  booking({ id: ids.booking2, bikeId: null, fleetNumber: null, quantity: 3, source: 'feed', feedId: feed.id, feedName: 'Online hires', title: 'Group ride', occurrences: [{ start: '2026-12-13T10:00:00.000Z', end: '2026-12-13T16:00:00.000Z' }] }),
];

function open(role: 'desk' | 'manager', created?: Booking) {
  const calls = mockFetch({
    'GET /api/sites': { body: { items: [quaySite] } },
    'GET /api/models': { body: { items: [strider] } },
    'GET /api/bookings': { body: { from: '2026-12-03T00:00:00.000Z', to: '2026-12-25T00:00:00.000Z', items } },
    'GET /api/bikes': { body: { items: [sm07] } },
    'GET /api/booking-feeds': { body: { items: [feed] } },
    'POST /api/bookings': { status: 201, body: created ?? items[0] },
  });
  renderAt('/bookings', '/bookings', <BookingsRoute />, user(role, role === 'desk' ? 'Cal Brennan' : 'Imogen Marsh'));
  return calls;
}

describe('bookings screen', () => {
  it('lists bookings in the site’s time, with delete for its own and a pointer to the calendar for a feed’s', async () => {
    open('desk');
    const table = await screen.findByRole('table');
    const rows = within(table).getAllByRole('row');
    // 09:00Z on Sat 12 Dec 2026 is 09:00 in London (GMT in winter, IANA database via @date-fns/tz).
    expect(rows[1].textContent).toContain('Sat 12 Dec 09:00–17:00');
    expect(rows[1].textContent).toContain('SM-07 (Strider 125)');
    expect(within(rows[1]).getByRole('button', { name: /Delete booking SM-07/ })).toBeTruthy();
    expect(rows[2].textContent).toContain('3 × Strider 125');
    expect(rows[2].textContent).toContain('Feed “Online hires”: change it in that calendar');
    expect(within(rows[2]).queryByRole('button')).toBeNull();
    // A desk books but does not manage calendars.
    expect(screen.queryByRole('heading', { name: 'Calendar feeds' })).toBeNull();
  });

  it('adds a booking with the start and end in the site’s local time and its offset', async () => {
    const calls = open('desk');
    await screen.findByRole('table');
    fireEvent.change(await screen.findByRole('option', { name: /SM-07/ }).then((o) => o.closest('select')!), { target: { value: ids.sm07 } });
    fireEvent.change(screen.getByLabelText('Start day'), { target: { value: '2026-12-12' } });
    fireEvent.change(screen.getByLabelText('Repeat weekly until'), { target: { value: '2027-01-09' } });
    fireEvent.click(screen.getByRole('button', { name: 'Add booking' }));
    await waitFor(() => expect(calls.some((c) => c.method === 'POST' && c.url === '/api/bookings')).toBe(true));
    const body = calls.find((c) => c.method === 'POST' && c.url === '/api/bookings')!.body as { start: string; end: string };
    expect(body).toMatchObject({ siteId: ids.quay, kind: 'hire', bikeId: ids.sm07, modelId: null, quantity: 1, rrule: 'FREQ=WEEKLY;UNTIL=20270109' });
    // Checked with @date-fns/tz: 09:00 and 17:00 on the London wall clock.
    expect(Date.parse(body.start)).toBe(new TZDate(2026, 11, 12, 9, 0, 0, 'Europe/London').getTime());
    expect(Date.parse(body.end)).toBe(new TZDate(2026, 11, 12, 17, 0, 0, 'Europe/London').getTime());
    expect(await screen.findByText(/Booked: SM-07/)).toBeTruthy();
  });

  it('refuses an end before the start before sending anything', async () => {
    const calls = open('desk');
    await screen.findByRole('table');
    fireEvent.change(await screen.findByRole('option', { name: /SM-07/ }).then((o) => o.closest('select')!), { target: { value: ids.sm07 } });
    fireEvent.change(screen.getByLabelText('Start day'), { target: { value: '2026-12-12' } });
    fireEvent.change(screen.getByLabelText('End time'), { target: { value: '08:00' } });
    fireEvent.click(screen.getByRole('button', { name: 'Add booking' }));
    expect(await screen.findByText(/The end is not after the start/)).toBeTruthy();
    expect(calls.some((c) => c.method === 'POST' && c.url === '/api/bookings')).toBe(false);
  });

  it('shows a manager each feed’s last load and last error in words', async () => {
    open('manager');
    expect(await screen.findByText('Could not load at 10:15: 404 Not Found. Showing the copy from 09:45, 42 events.')).toBeTruthy();
    expect(screen.getByRole('button', { name: 'Remove feed Online hires and its bookings' })).toBeTruthy();
  });
});
