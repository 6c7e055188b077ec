// @vitest-environment jsdom
import { cleanup, fireEvent, screen } from '@testing-library/react';
import { afterEach, describe, expect, it } from 'vitest';
import { CheckInRoute } from '../../src/features/check-in/routes/check-in';
import type { NextVisit } from '../../shared/schemas/plan';
import { failOnConsoleError, ids, mockFetch, renderAt, user } from './plan-board-support';

afterEach(() => {
  cleanup();
  localStorage.clear();
});
failOnConsoleError();

const bike = {
  id: ids.sm07, fleetNumber: 'SM-07', vin: null, registration: 'SM07 QST', model: { id: ids.booking2, name: 'Strider 125' }, site: { id: ids.quay, name: 'Quay Street' },
  status: 'in_service' as const, statusReason: null, odometerUnit: 'km' as const, inServiceDate: '2025-03-01', inServiceOdometer: 0,
  latestOdometer: 12_000, latestOdometerKm: 12_000, latestReadingDate: '2026-07-06',
};
const detail = { bike, readings: [], due: [], ride: { mayRide: true, reasons: [] } };
const saved = {
  reading: { id: ids.task5, date: '2026-07-07', value: 12_140, unit: 'km', odometerKm: 12_140, reset: false },
  bike: { ...bike, latestOdometer: 12_140, latestOdometerKm: 12_140, latestReadingDate: '2026-07-07' }, due: [], grounded: false, defectId: null, ride: { mayRide: true, reasons: [] },
};
const visitOf = (over: Partial<NextVisit>): NextVisit => ({
  bikeId: ids.sm07, visitId: ids.visitA, start: '2026-07-07T08:00:00.000Z', end: '2026-07-07T09:30:00.000Z', bayName: 'Bay 2', siteTimeZone: 'Europe/London', today: false, ...over,
});

function open(items: NextVisit[]) {
  const calls = mockFetch({
    [`GET /api/bikes/${ids.sm07}`]: { body: detail },
    'GET /api/plan/next-visits': { body: { items } },
    [`POST /api/bikes/${ids.sm07}/check-ins`]: { body: saved },
  });
  renderAt(`/check-in?bike=${ids.sm07}`, '/check-in', <CheckInRoute />, user('desk', 'Cal Brennan'));
  return calls;
}

const typeReading = async () => {
  fireEvent.change(await screen.findByLabelText(/Odometer now/), { target: { value: '12140' } });
  fireEvent.click(screen.getByRole('button', { name: 'Save check-in' }));
};
const posts = (calls: { method: string }[]) => calls.filter((c) => c.method === 'POST').length;

describe('check-in: the bike’s next workshop visit', () => {
  it('says when and where the bike is due in the workshop, on the site’s clock', async () => {
    // 08:00Z on Tue 7 Jul 2026 is 09:00 in London, on summer time (UTC+1) until the last Sunday of October (IANA database, via Intl).
    const calls = open([visitOf({}), visitOf({ bikeId: ids.sm03, visitId: ids.visitB, bayName: 'Bay 1', start: '2026-07-07T06:00:00.000Z' })]);
    expect((await screen.findByTestId('workshop-notice')).textContent).toBe('◔ Due in the workshop: Tue 09:00, Bay 2');
    expect(calls.find((c) => c.url.startsWith('/api/plan/next-visits'))?.url).toBe(`/api/plan/next-visits?site=${ids.quay}`);
    // Not today: the check-in saves as it always has, without a question.
    await typeReading();
    expect(await screen.findByText(/Saved for SM-07/)).toBeTruthy();
    expect(screen.queryByTestId('hand-out-check')).toBeNull();
    expect(posts(calls)).toBe(1);
  });

  it('asks before a bike planned into the workshop today goes out, and saves only once answered', async () => {
    const calls = open([visitOf({ today: true, start: '2026-07-07T12:00:00.000Z', end: '2026-07-07T13:00:00.000Z' })]);
    expect((await screen.findByTestId('workshop-notice')).textContent).toContain('Due in the workshop today: 13:00, Bay 2.');
    await typeReading();
    const check = await screen.findByTestId('hand-out-check');
    expect(check.getAttribute('role')).toBe('alert');
    expect(check.textContent).toContain('SM-07 is planned into Bay 2 today at 13:00. Hand it out anyway?');
    expect(posts(calls)).toBe(0);
    fireEvent.click(screen.getByRole('button', { name: 'Yes, hand it out' }));
    expect(await screen.findByText('SM-07 goes out: tell the workshop it will miss its visit in Bay 2 at 13:00.')).toBeTruthy();
    expect(posts(calls)).toBe(1);
  });

  it('keeps the bike back for the workshop when the desk says so, with the reading saved', async () => {
    const calls = open([visitOf({ today: true, start: '2026-07-07T12:00:00.000Z' })]);
    await screen.findByTestId('workshop-notice');
    await typeReading();
    fireEvent.click(await screen.findByRole('button', { name: 'No, keep it for the workshop' }));
    expect(await screen.findByText('Keep SM-07 at the site: it is due in Bay 2 at 13:00.')).toBeTruthy();
    expect(posts(calls)).toBe(1);
  });

  it('shows nothing about the workshop for a bike with no visit in the next two days', async () => {
    open([visitOf({ bikeId: ids.sm03 })]);
    await screen.findByLabelText(/Odometer now/);
    await screen.findByText(/SM07 QST/);
    expect(screen.queryByTestId('workshop-notice')).toBeNull();
  });
});
