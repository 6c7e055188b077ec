// @vitest-environment jsdom
import { beforeEach, describe, expect, it, vi } from 'vitest';
import { QueryClient } from '@tanstack/react-query';
import { ApiError } from '../../src/lib/api-client';

// The device's store as a map: the queue's own rules are what is under test.
const kept = new Map<string, unknown>();
vi.mock('../../src/lib/offline/device-store', () => ({
  deviceGet: async (k: string) => structuredClone(kept.get(k)),
  deviceSet: async (k: string, v: unknown) => void kept.set(k, structuredClone(v)),
}));
const write = vi.fn();
vi.mock('../../src/lib/api-client', async (orig) => {
  const real = await orig<typeof import('../../src/lib/api-client')>();
  return { ...real, api: { ...real.api, write: (...a: unknown[]) => write(...a) } };
});

const { enqueue, flush, outcomeOf, writeOrQueue, dropChangesOf } = await import('../../src/lib/offline/queue');
const queued = () => (kept.get('lashline.queue') as { changes: { id: string; userId: string; label: string; state: string; problem?: string }[] } | undefined)?.changes ?? [];
const online = (on: boolean) => Object.defineProperty(navigator, 'onLine', { configurable: true, get: () => on });

beforeEach(async () => {
  write.mockReset();
  online(true);
  for (const u of ['ruth', 'cal']) await dropChangesOf(u);
});

const change = (id: string, userId = 'ruth') => ({ id, userId, method: 'POST' as const, url: `/api/bikes/${id}/check-ins`, body: { odometer: 1 }, label: `Check-in ${id}` });

describe('the device queue', () => {
  it('sends one person’s changes oldest first, each with its own key, and keeps another person’s', async () => {
    await enqueue(change('a'));
    await enqueue(change('b', 'cal'));
    await enqueue(change('c'));
    write.mockResolvedValue({});
    await flush('ruth', new QueryClient());
    expect(write.mock.calls.map((c) => c[3])).toEqual(['a', 'c']);
    expect(queued().map((c) => c.id)).toEqual(['b']);
  });

  it('stops at a change that cannot get through and keeps it and those after it, in order', async () => {
    await enqueue(change('a'));
    await enqueue(change('b'));
    write.mockRejectedValueOnce(new ApiError(0, 'network', 'no connection'));
    await flush('ruth', new QueryClient());
    expect(write).toHaveBeenCalledTimes(1);
    expect(queued().map((c) => [c.id, c.state])).toEqual([['a', 'waiting'], ['b', 'waiting']]);
    // The next pass sends the same change again under the same key: the server applies it once.
    write.mockResolvedValue({});
    await flush('ruth', new QueryClient());
    expect(write.mock.calls.map((c) => c[3])).toEqual(['a', 'a', 'b']);
    expect(queued()).toEqual([]);
  });

  it('marks a refusal with the server’s reason and goes on with the next', async () => {
    await enqueue(change('a'));
    await enqueue(change('b'));
    write.mockRejectedValueOnce(new ApiError(409, 'needs_confirmation', 'More than 1,000 km a day.')).mockResolvedValue({});
    await flush('ruth', new QueryClient());
    expect(queued()).toMatchObject([{ id: 'a', state: 'refused', problem: 'More than 1,000 km a day.' }]);
  });

  it('reads each answer for what it means', () => {
    expect(outcomeOf(new ApiError(0, 'network', ''))).toBe('retry-later');
    expect(outcomeOf(new ApiError(503, 'unavailable', ''))).toBe('retry-later');
    expect(outcomeOf(new ApiError(409, 'in_progress', ''))).toBe('retry-later');
    expect(outcomeOf(new ApiError(429, 'too_many_requests', ''))).toBe('retry-later');
    expect(outcomeOf(new ApiError(401, 'not_signed_in', ''))).toBe('sign-in');
    expect(outcomeOf(new ApiError(409, 'conflict', ''))).toBe('refused');
    expect(outcomeOf(new ApiError(422, 'key_reused', ''))).toBe('refused');
  });

  it('queues a change made offline, or one whose connection failed on the way, under the key it was tried with', async () => {
    online(false);
    const r1 = await writeOrQueue({ ...change('x'), method: 'POST' }, (d) => d);
    expect(r1.queued).toBe(true);
    expect(write).not.toHaveBeenCalled();
    online(true);
    write.mockRejectedValueOnce(new ApiError(0, 'network', 'reset'));
    const r2 = await writeOrQueue({ ...change('y') }, (d) => d);
    expect(r2.queued).toBe(true);
    expect(queued().at(-1)!.id).toBe(write.mock.calls[0][3]);
    write.mockResolvedValueOnce({ ok: 1 });
    expect(await writeOrQueue({ ...change('z') }, (d) => d)).toEqual({ queued: false, data: { ok: 1 } });
    // A refusal while online is the caller's to show, not queued.
    write.mockRejectedValueOnce(new ApiError(409, 'conflict', 'no'));
    await expect(writeOrQueue({ ...change('w') }, (d) => d)).rejects.toThrow('no');
    expect(queued()).toHaveLength(2);
  });
});
