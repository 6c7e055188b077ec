import autocannon from 'autocannon';
import type { Session } from './http-session';

export interface LoadFigures {
  requests: number;
  seconds: number;
  perSecond: number;
  p50: number;
  p97_5: number;
  p99: number;
  max: number;
  status: Record<string, number>;
  non2xx: number;
  errors: number;
  timeouts: number;
}

const figures = (r: autocannon.Result): LoadFigures => ({
  requests: r.requests.total,
  seconds: r.duration,
  perSecond: r.requests.total / r.duration,
  p50: r.latency.p50,
  p97_5: r.latency.p97_5,
  p99: r.latency.p99,
  max: r.latency.max,
  status: Object.fromEntries(Object.entries(r.statusCodeStats ?? {}).map(([k, v]) => [k, v.count ?? 0])),
  non2xx: r.non2xx,
  errors: r.errors,
  timeouts: r.timeouts,
});

/**
 * The due list under 20 connections for a fixed time, with the manager's session cookie and the
 * Accept-Encoding every browser sends (the screen's answer travels gzipped).
 */
export async function dueListLoad(url: string, s: Session, opts = { connections: 20, duration: 10 }) {
  const r = await autocannon({
    url: `${url}/api/due?within=7`,
    connections: opts.connections,
    duration: opts.duration,
    // Long enough that a slow answer counts as slow rather than as an error.
    timeout: 120,
    headers: { cookie: s.cookie, 'accept-encoding': 'gzip, deflate, br' },
  });
  return figures(r);
}

export interface CheckInRun extends LoadFigures {
  /** Ids of the readings the 201 answers returned. */
  createdIds: string[];
}

/**
 * Check-ins across the whole fleet: each request takes the next bike in turn and a reading a few km
 * above the last one sent for it, so every request is a valid check-in. With `amount`, autocannon
 * stops after exactly that many answers, so none is left in flight at the end.
 */
export function checkInLoader(url: string, s: Session, bikes: { id: string; value: number }[]) {
  const next = new Map(bikes.map((b) => [b.id, b.value]));
  let turn = 0;
  return async (opts: { connections: number; duration?: number; amount?: number }): Promise<CheckInRun> => {
    const createdIds: string[] = [];
    const t0 = performance.now();
    let lastAnswer = t0;
    const r = await autocannon({
      url,
      connections: opts.connections,
      ...(opts.amount ? { amount: opts.amount } : { duration: opts.duration ?? 10 }),
      timeout: 120,
      requests: [
        {
          method: 'POST',
          headers: { cookie: s.cookie, 'x-csrf-token': s.csrf, 'content-type': 'application/json' },
          setupRequest: (req) => {
            const b = bikes[turn++ % bikes.length];
            const odometer = next.get(b.id)! + 3;
            next.set(b.id, odometer);
            return { ...req, path: `/api/bikes/${b.id}/check-ins`, body: JSON.stringify({ odometer }) };
          },
          onResponse: (status, body) => {
            lastAnswer = performance.now();
            if (status === 201) createdIds.push((JSON.parse(body) as { reading: { id: string } }).reading.id);
          },
        },
      ],
    });
    // autocannon ends a run, and counts its duration, on whole seconds (its ticks): a run of
    // `amount` requests answered in 5.2 s reads as 6.01 s. The rate runs to the last answer.
    const seconds = (lastAnswer - t0) / 1000;
    return { ...figures(r), seconds, perSecond: r.requests.total / seconds, createdIds };
  };
}
