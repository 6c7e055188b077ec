import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { sql } from 'drizzle-orm';
import { agent, testApp, type Agent, type TestContext } from '../support/test-app';
import { PASSWORD, world } from '../support/factories';
import { listRoutes } from '../../server/route-table';
import { ERROR_CODES } from '../../shared/errors';

// Property: whatever arrives, the API answers below 500, every refusal in the one error shape,
// and a refused request writes nothing (OWASP ASVS 5.0 V2.2.1 input validation; V16.5 error handling).
const SKIP = new Set(['POST /api/auth/logout']);
const RUNS = Number(process.env.FUZZ_RUNS ?? 12);

let t: TestContext;
let admin: Agent;
let manager: Agent;
beforeAll(async () => {
  t = await testApp({ config: { LOGIN_MAX_PER_IP: 100_000, LOGIN_MAX_PER_ACCOUNT: 100_000 } });
  const w = await world(t.database.db);
  admin = await agent(t.app);
  await admin.login(w.people.admin.email, PASSWORD);
  manager = await agent(t.app);
  await manager.login(w.people.manager.email, PASSWORD);
});
afterAll(() => t.close());

async function totalRows() {
  const { rows } = (await t.database.db.execute(sql`select table_name from information_schema.tables where table_schema = 'public' and table_name not in ('sessions', 'audit_log', 'idempotent_requests', '__drizzle_migrations')`)) as unknown as { rows: { table_name: string }[] };
  const q = rows.map((r) => `(select count(*) from "${r.table_name}")`).join(' + ');
  const res = (await t.database.db.execute(sql.raw(`select ${q} as n`))) as unknown as { rows: { n: string | number }[] };
  return Number(res.rows[0].n);
}

const hostile = fc.oneof(
  fc.string(),
  fc.constantFrom("' or 1=1 --", '<script>alert(1)</script>', '../../etc/passwd', '\u0000', '%00', '9'.repeat(400), '{"$gt":""}', 'NaN', '-1', '1e309', '2026-02-30', 'ÿ'.repeat(50)),
);
const value = fc.oneof(hostile, fc.integer(), fc.double(), fc.boolean(), fc.constant(null), fc.array(hostile, { maxLength: 3 }));
const body = fc.oneof(fc.dictionary(fc.oneof(hostile, fc.constantFrom('odometer', 'email', 'password', 'version', 'readings', 'siteId', 'status', 'name', 'csv')), value, { maxKeys: 6 }), fc.jsonValue());
const idempotencyKey = fc.option(fc.oneof(fc.uuid(), fc.stringMatching(/^[ -~]{0,20}$/)), { nil: null });
const segment = fc.oneof(hostile.filter((s) => s.length > 0), fc.uuid(), fc.constant('00000000-0000-0000-0000-000000000000'));

describe('hostile input on every route', () => {
  it('never answers 500, always in the error shape, and writes nothing when it refuses', async () => {
    const routes = listRoutes(t.app).filter((r) => r.path.startsWith('/api') && !SKIP.has(`${r.method} ${r.path}`));
    let cases = 0;
    for (const r of routes) {
      await fc.assert(
        // Half the unsafe requests carry an Idempotency-Key, well-formed or not, as a tablet's queue sends them.
        fc.asyncProperty(fc.array(segment, { minLength: 3, maxLength: 3 }), fc.dictionary(fc.string({ maxLength: 12 }), hostile, { maxKeys: 4 }), body, fc.boolean(), idempotencyKey, async (segs, query, payload, asManager, key) => {
          let i = 0;
          const path = r.path.replace(/:[a-zA-Z]+/g, () => encodeURIComponent(segs[i++ % segs.length]));
          const qs = new URLSearchParams(query).toString();
          const url = qs ? `${path}?${qs}` : path;
          const who = asManager ? manager : admin;
          const method = r.method.toLowerCase() as 'get' | 'post' | 'put' | 'patch' | 'delete';
          const before = method === 'get' ? 0 : await totalRows();
          const send = () => {
            const req = who[method](url).set('content-type', 'application/json');
            if (key !== null) req.set('Idempotency-Key', key);
            return req.send(JSON.stringify(payload));
          };
          const res = method === 'get' ? await who.get(url) : await send();
          cases++;
          expect(res.status, `${r.method} ${url}`).toBeLessThan(500);
          if (res.status >= 400) {
            expect(ERROR_CODES, `${r.method} ${url} → ${res.status}`).toContain(res.body?.error?.code);
            expect(typeof res.body.error.message).toBe('string');
            if (method !== 'get') expect(await totalRows(), `${r.method} ${url} wrote on refusal`).toBe(before);
          }
          // The same request with the same key again: the same answer, and nothing more written.
          if (method !== 'get' && key !== null && res.status < 500) {
            const rows = await totalRows();
            const again = await send();
            if (again.status !== 401 && again.status !== 403 && again.status !== 429) {
              expect(again.status, `${r.method} ${url} replayed`).toBe(res.status);
              expect(await totalRows(), `${r.method} ${url} applied twice`).toBe(rows);
            }
          }
        }),
        { numRuns: RUNS },
      );
    }
    console.log(`fuzz: ${cases} hostile requests over ${routes.length} routes`);
  }, 600_000);
});
