import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { testApp, type TestContext } from '../support/test-app';

let t: TestContext;
beforeAll(async () => {
  t = await testApp();
});
afterAll(() => t.close());

// RFC 9562 UUID, as crypto.randomUUID makes them.
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-4[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/;

describe('request ids', () => {
  it('names every API answer with a request id of its own, the one the log lines carry', async () => {
    const a = await request(t.app).get('/api/health');
    const b = await request(t.app).get('/api/health');
    expect(a.headers['x-request-id']).toMatch(UUID);
    expect(b.headers['x-request-id']).not.toBe(a.headers['x-request-id']);
  });

  it('keeps the id a proxy sent, and replaces one that could not be a log field', async () => {
    expect((await request(t.app).get('/api/health').set('X-Request-Id', 'edge-42.abc')).headers['x-request-id']).toBe('edge-42.abc');
    expect((await request(t.app).get('/api/health').set('X-Request-Id', 'a b"c')).headers['x-request-id']).toMatch(UUID);
  });
});
