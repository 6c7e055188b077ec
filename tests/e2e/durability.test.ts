import { afterAll, describe, expect, it } from 'vitest';
import { spawn } from 'node:child_process';
import { SERVER_BUNDLE, SERVER_NODE_FLAGS } from '../../server/build';
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import request from 'supertest';
import { startDemoServer, DEMO_PASSWORD, type Running } from './support';

// Faults a workshop meets: the server killed mid-stream (power cut, OOM killer), a second copy started
// on the same data, an orderly stop. Nothing answered 2xx may be lost.
const servers: Running[] = [];
afterAll(async () => {
  for (const s of servers.reverse()) await s.stop().catch(() => {});
});

async function signedIn(url: string, email: string) {
  const a = request.agent(url);
  const { token } = (await a.get('/api/auth/csrf')).body;
  const res = await a.post('/api/auth/login').set('x-csrf-token', token).send({ email, password: DEMO_PASSWORD });
  expect(res.status).toBe(200);
  return { a, token: res.body.csrfToken as string };
}

describe('durability of the embedded database', () => {
  it('keeps every acknowledged check-in across SIGKILL, refuses a second process, and stops cleanly on SIGTERM', async () => {
    const first = await startDemoServer({ SCHEDULER: 'off' });
    servers.push(first);
    const { a, token } = await signedIn(first.url, 'cal@saltmarsh.test');
    const bikes = (await a.get('/api/bikes')).body.items.filter((b: { status: string }) => b.status !== 'retired').slice(0, 6);
    const next = new Map<string, number>(bikes.map((b: { id: string; latestOdometer: number | null }) => [b.id, Math.ceil(b.latestOdometer ?? 0) + 1]));
    const acknowledged: { bikeId: string; readingId: string }[] = [];
    let killed = false;
    const send = async (bikeId: string) => {
      const odometer = next.get(bikeId)!;
      next.set(bikeId, odometer + 3);
      try {
        const res = await a.post(`/api/bikes/${bikeId}/check-ins`).set('x-csrf-token', token).send({ odometer });
        if (res.status === 201) acknowledged.push({ bikeId, readingId: res.body.reading.id });
      } catch {
        // Connection cut by the kill: not acknowledged, so not counted.
      }
    };
    const streams = bikes.map(async (b: { id: string }) => {
      while (!killed) await send(b.id);
    });
    while (acknowledged.length < 40) await new Promise((r) => setTimeout(r, 20));
    first.signal('SIGKILL');
    killed = true;
    await Promise.all(streams);
    await first.exited;

    // Restart on the same directory: the dead owner's lock is taken over, the database opens.
    const second = await startDemoServer({ SCHEDULER: 'off' }, first.dataDir);
    servers.push(second);
    const again = await signedIn(second.url, 'cal@saltmarsh.test');
    const missing: string[] = [];
    for (const b of bikes) {
      const ids = new Set((await again.a.get(`/api/bikes/${b.id}`)).body.readings.map((r: { id: string }) => r.id));
      for (const ack of acknowledged.filter((x) => x.bikeId === b.id)) if (!ids.has(ack.readingId)) missing.push(ack.readingId);
    }
    console.log(`crash round: ${acknowledged.length} acknowledged check-ins before SIGKILL, ${missing.length} missing after restart`);
    expect(missing).toEqual([]);

    // A second process on the same data directory is refused with a clear message.
    const third = spawn(process.execPath, [SERVER_BUNDLE], { env: { ...process.env, PORT: '0', DATA_DIR: first.dataDir, SCHEDULER: 'off' }, stdio: ['ignore', 'pipe', 'pipe'] });
    let err = '';
    third.stderr!.on('data', (d) => (err += d));
    const code = await new Promise<number | null>((r) => third.on('exit', r));
    expect(code).toBe(2);
    expect(err).toMatch(/in use by/);

    // SIGTERM: requests in flight finish, PGlite closes, the lock is released.
    second.signal('SIGTERM');
    expect(await second.exited).toBe(0);
    expect(existsSync(join(first.dataDir, 'lashline.lock'))).toBe(false);
  }, 180_000);
});
