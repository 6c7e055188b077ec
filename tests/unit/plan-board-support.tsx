// Shared by the planning screens' component tests: a signed-in user, a fresh query client, and a fetch
// that answers from a table of routes and records what was asked.
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { render } from '@testing-library/react';
import type { ReactNode } from 'react';
import { MemoryRouter, Outlet, Route, Routes } from 'react-router-dom';
import { afterEach, beforeEach, expect, vi } from 'vitest';
import type { SessionUser } from '../../shared/schemas/auth';
import type { PlanAnswer, PlanVisit } from '../../shared/schemas/plan';

export const ids = {
  quay: '00000000-0000-4000-8000-000000000001',
  bay1: '00000000-0000-4000-8000-000000000011',
  bay2: '00000000-0000-4000-8000-000000000012',
  tomasz: '00000000-0000-4000-8000-000000000021',
  priya: '00000000-0000-4000-8000-000000000022',
  sm07: '00000000-0000-4000-8000-000000000031',
  sm03: '00000000-0000-4000-8000-000000000032',
  sm11: '00000000-0000-4000-8000-000000000033',
  visitA: '00000000-0000-4000-8000-000000000041',
  visitB: '00000000-0000-4000-8000-000000000042',
  visitC: '00000000-0000-4000-8000-000000000043',
  task1: '00000000-0000-4000-8000-000000000051',
  task2: '00000000-0000-4000-8000-000000000052',
  task3: '00000000-0000-4000-8000-000000000053',
  task4: '00000000-0000-4000-8000-000000000054',
  task5: '00000000-0000-4000-8000-000000000055',
  booking1: '00000000-0000-4000-8000-000000000061',
  booking2: '00000000-0000-4000-8000-000000000062',
  me: '00000000-0000-4000-8000-000000000071',
};

export const quaySite = { id: ids.quay, name: 'Quay Street', timeZone: 'Europe/London', bays: 2 };

export function user(role: SessionUser['role'], name = 'Imogen Marsh'): SessionUser {
  return { id: ids.me, name, email: 'imogen@saltmarsh.example', role, siteIds: [ids.quay] };
}

export function visit(over: Partial<PlanVisit> & Pick<PlanVisit, 'id' | 'start' | 'end'>): PlanVisit {
  return {
    bikeId: ids.sm07,
    fleetNumber: 'SM-07',
    modelName: 'Strider 125',
    siteId: ids.quay,
    bayId: ids.bay1,
    bayName: 'Bay 1',
    technicianId: ids.tomasz,
    technicianName: 'Tomasz Reed',
    taskIds: [],
    tasks: [],
    latestDate: '2026-12-10',
    pinned: false,
    sequence: 1,
    why: [],
    ...over,
  };
}

/** Two weeks at Quay Street from Mon 7 Dec 2026: three visits on Tue 8 Dec in Bay 1, given out of time order. */
export function planAnswer(): PlanAnswer {
  return {
    from: '2026-12-07',
    to: '2026-12-20',
    visits: [
      visit({
        id: ids.visitA,
        start: '2026-12-08T09:00:00.000Z',
        end: '2026-12-08T10:30:00.000Z',
        taskIds: [ids.task1, ids.task2],
        tasks: [
          { id: ids.task1, itemName: 'Valve clearance check', minutes: 60, dueDate: '2026-12-10', safetyCritical: false, status: 'open' },
          { id: ids.task2, itemName: 'Brake fluid change', minutes: 30, dueDate: '2026-12-09', safetyCritical: true, status: 'open' },
        ],
        why: ['Brake fluid falls due on 9 Dec: safety-critical work goes first.', 'Bay 1 is free before the hire at 11:00.'],
        latestDate: '2026-12-09',
        sequence: 2,
      }),
      visit({
        id: ids.visitB,
        bikeId: ids.sm03,
        fleetNumber: 'SM-03',
        modelName: 'Breeze 125',
        start: '2026-12-08T13:00:00.000Z',
        end: '2026-12-08T13:45:00.000Z',
        taskIds: [ids.task3],
        tasks: [{ id: ids.task3, itemName: 'Chain adjust', minutes: 45, dueDate: '2026-12-12', safetyCritical: false, status: 'open' }],
        pinned: true,
        sequence: 3,
      }),
      visit({
        id: ids.visitC,
        bikeId: ids.sm11,
        fleetNumber: 'SM-11',
        modelName: 'Pathfinder 250',
        start: '2026-12-08T08:00:00.000Z',
        end: '2026-12-08T08:30:00.000Z',
        taskIds: [ids.task4],
        tasks: [{ id: ids.task4, itemName: 'Tyre check', minutes: 30, dueDate: '2026-12-08', safetyCritical: false, status: 'open' }],
        technicianId: ids.priya,
        technicianName: 'Priya Vale',
        sequence: 1,
      }),
    ],
    unplaced: [
      {
        taskId: ids.task5,
        bikeId: ids.sm11,
        fleetNumber: 'SM-11',
        siteId: ids.quay,
        itemName: 'Fork oil change',
        dueDate: '2026-12-11',
        reason: 'No bay free at Quay Street before 11 Dec; 3 h short.',
        remedy: 'Plan it at Airfield, or add overtime on Sat 12 Dec.',
      },
    ],
    capacity: [{ siteId: ids.quay, date: '2026-12-08', plannedMinutes: 240, availableMinutes: 480 }],
    bookings: [
      { bookingId: ids.booking1, siteId: ids.quay, bikeId: ids.sm07, modelId: null, modelName: null, quantity: 1, kind: 'hire', title: 'Coast ride', start: '2026-12-08T11:00:00.000Z', end: '2026-12-08T17:00:00.000Z' },
      { bookingId: ids.booking2, siteId: ids.quay, bikeId: null, modelId: ids.sm03, modelName: 'Breeze 125', quantity: 2, kind: 'lesson', title: 'CBT morning', start: '2026-12-09T08:30:00.000Z', end: '2026-12-09T12:30:00.000Z' },
    ],
    bays: [
      { id: ids.bay1, siteId: ids.quay, name: 'Bay 1' },
      { id: ids.bay2, siteId: ids.quay, name: 'Bay 2' },
    ],
    technicians: [
      { id: ids.tomasz, siteId: ids.quay, name: 'Tomasz Reed' },
      // Priya Vale covers a shift at Quay Street this fortnight.
      { id: ids.priya, siteId: ids.quay, name: 'Priya Vale' },
    ],
    plannedAt: '2026-12-07T06:00:00.000Z',
  };
}

export interface Call {
  method: string;
  url: string;
  body: unknown;
}

type Answer = { status?: number; body: unknown } | ((call: Call) => { status?: number; body: unknown });

/** A fetch that answers `METHOD /path` (the query string ignored) from the table; anything else fails the test. */
export function mockFetch(routes: Record<string, Answer>) {
  const calls: Call[] = [];
  const fn = vi.fn(async (input: string | URL | Request, init?: RequestInit) => {
    const url = String(input);
    const method = init?.method ?? 'GET';
    const call = { method, url, body: init?.body ? JSON.parse(String(init.body)) : undefined };
    calls.push(call);
    if (url === '/api/auth/csrf') return new Response(JSON.stringify({ token: 't' }), { status: 200 });
    const answer = routes[`${method} ${url.split('?')[0]}`];
    if (!answer) throw new Error(`No answer set for ${method} ${url}`);
    const { status = 200, body } = typeof answer === 'function' ? answer(call) : answer;
    return new Response(JSON.stringify(body), { status, headers: { 'content-type': 'application/json' } });
  });
  vi.stubGlobal('fetch', fn);
  return calls;
}

/** console.error during a test means React or the router complained: fail it. */
export function failOnConsoleError() {
  let spy: ReturnType<typeof vi.spyOn>;
  beforeEach(() => {
    spy = vi.spyOn(console, 'error');
  });
  afterEach(() => {
    expect(spy).not.toHaveBeenCalled();
    spy.mockRestore();
    vi.unstubAllGlobals();
  });
}

export function renderAt(path: string, route: string, element: ReactNode, me: SessionUser) {
  const client = new QueryClient({ defaultOptions: { queries: { retry: false }, mutations: { retry: false } } });
  return render(
    <QueryClientProvider client={client}>
      <MemoryRouter initialEntries={[path]}>
        <Routes>
          <Route element={<Outlet context={me} />}>
            <Route path={route} element={element} />
          </Route>
        </Routes>
      </MemoryRouter>
    </QueryClientProvider>,
  );
}
