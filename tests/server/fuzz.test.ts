import fs from 'node:fs';
import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { listRoutes, type RouteInfo } from '../../server/lib/routes';
import { createOrganization, createUser, TEST_PASSWORD } from '../support/factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

// Generated and mutated bodies, queries and headers against every state-changing route the server registers:
// never a 5xx, never a stack trace, and a refused request writes no row.
const RUNS = Number(process.env.FUZZ_RUNS ?? 1000);
// Tables a refused request may legitimately touch: failed sign-ins are counted on purpose; sessions churn.
const ALLOWED_WRITES = new Set(['login_limits', 'sessions']);

let t: TestContext;
let server: Server;
let base: string;
let tables: string[];
let ids: string[];

async function signInCookie(email: string) {
  const r = await fetch(`${base}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email, password: TEST_PASSWORD }),
  });
  return r.headers
    .getSetCookie()
    .find((c) => c.startsWith('lp.sid='))!
    .split(';')[0];
}

async function rowCounts() {
  const sql = tables.map((tb) => `SELECT '${tb}' AS t, COUNT(*) AS n FROM \`${tb}\``).join(' UNION ALL ');
  const rows: { t: string; n: string }[] = await t.ds.query(sql);
  return new Map(rows.map((r) => [r.t, Number(r.n)]));
}

const pathValue = () =>
  fc.oneof(
    fc.uuid(),
    fc.constantFrom(...ids),
    fc.string({ maxLength: 40 }),
    fc.constantFrom('..%2f..%2fetc', '%00', '0', '-1', 'null'),
  );

// Valid bodies for the routes that have one; the fuzzer mutates them (one field replaced, dropped or added) so
// that requests get past validation into the services. Routes without a sample get generated bodies only.
const SAMPLES: Record<string, () => Record<string, unknown>> = {
  'POST /api/auth/login': () => ({ email: 'someone@example.test', password: 'a password' }),
  'POST /api/users/invitations': () => ({
    email: `fuzz-${Math.random().toString(36).slice(2)}@example.test`,
    name: 'Fuzz',
    roles: ['reviewer'],
  }),
  'PATCH /api/users/:id': () => ({ roles: ['reviewer', 'accountant'] }),
  'POST /api/invitations/:token/accept': () => ({ password: 'a long enough password' }),
  'POST /api/auth/password/forgot': () => ({ email: 'someone@example.test' }),
  'POST /api/auth/password/reset': () => ({
    token: 'AAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAA',
    password: 'a long enough password',
  }),
  'POST /api/auth/password/change': () => ({
    currentPassword: TEST_PASSWORD,
    newPassword: 'a long enough password',
  }),
};

SAMPLES['POST /api/evaluations'] = () =>
  JSON.parse(fs.readFileSync('tests/shared/engine/fixtures/valid-claim.json', 'utf8'));

/** Every path to a value inside a sample, nested objects and arrays included. */
function leafPaths(v: unknown, prefix: (string | number)[] = []): (string | number)[][] {
  if (v && typeof v === 'object') {
    const entries = Array.isArray(v) ? v.map((x, i) => [i, x] as const) : Object.entries(v);
    return [prefix, ...entries.flatMap(([k, x]) => leafPaths(x, [...prefix, k]))];
  }
  return [prefix];
}

function setAt(obj: unknown, path: (string | number)[], value: unknown, drop = false): unknown {
  if (path.length === 0) return value;
  const copy = (Array.isArray(obj) ? [...obj] : { ...(obj as object) }) as Record<string | number, unknown>;
  const [head, ...rest] = path;
  if (rest.length === 0 && drop) delete copy[head];
  else copy[head] = setAt(copy[head], rest, value, drop);
  return copy;
}

/** One value anywhere in the sample replaced, or dropped, or an unknown key added. */
const mutate = (sample: Record<string, unknown>) => {
  const paths = leafPaths(sample).filter((p) => p.length > 0);
  return fc.oneof(
    fc.constant(sample),
    fc
      .tuple(
        fc.constantFrom(...paths),
        fc.oneof(fc.jsonValue({ maxDepth: 2 }), fc.double(), fc.constantFrom(-1, 0, 1e308, '', '1,5', null)),
      )
      .map(([p, v]) => setAt(sample, p, v)),
    fc.constantFrom(...paths).map((p) => setAt(sample, p, undefined, true)),
    fc
      .tuple(fc.string({ maxLength: 12 }), fc.jsonValue({ maxDepth: 2 }))
      .map(([k, v]) => ({ ...sample, [k]: v })),
  );
};

const genericBody = fc.oneof(
  fc.anything({ maxDepth: 3 }),
  fc.dictionary(fc.string({ maxLength: 20 }), fc.jsonValue({ maxDepth: 3 }), { maxKeys: 8 }),
  fc.record(
    {
      email: fc.oneof(fc.emailAddress(), fc.string()),
      name: fc.string({ maxLength: 300 }),
      password: fc.string({ maxLength: 300 }),
      roles: fc.array(
        fc.oneof(fc.constantFrom('installer', 'reviewer', 'accountant', 'administrator'), fc.string()),
        { maxLength: 5 },
      ),
      status: fc.oneof(fc.constantFrom('active', 'disabled', 'invited'), fc.string()),
    },
    { requiredKeys: [] },
  ),
);

const makeRequest = (route: RouteInfo) =>
  fc.record({
    body: SAMPLES[`${route.method} ${route.path}`]
      ? fc.oneof(
          { arbitrary: mutate(SAMPLES[`${route.method} ${route.path}`]()), weight: 3 },
          { arbitrary: genericBody, weight: 1 },
        )
      : genericBody,
    query: fc.dictionary(
      fc.constantFrom('page', 'pageSize', 'sort', 'q', 'dryRun', 'stage', 'x'),
      fc.oneof(fc.string(), fc.integer().map(String)),
      { maxKeys: 4 },
    ),
    contentType: fc.oneof(
      { arbitrary: fc.constant('application/json'), weight: 6 },
      {
        arbitrary: fc.constantFrom(
          'text/plain',
          'application/x-www-form-urlencoded',
          'application/json; charset=latin1',
          'multipart/form-data',
        ),
        weight: 1,
      },
    ),
    raw: fc.oneof({ arbitrary: fc.constant(false), weight: 9 }, { arbitrary: fc.constant(true), weight: 1 }),
    params: fc.array(pathValue(), { minLength: 3, maxLength: 3 }),
  });

beforeAll(async () => {
  t = await createTestApp();
  server = t.app.listen(0, '127.0.0.1');
  await new Promise((r) => server.once('listening', r));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  const rows: { t: string }[] = await t.ds.query(
    "SELECT table_name AS t FROM information_schema.tables WHERE table_schema = DATABASE() AND table_type = 'BASE TABLE'",
  );
  tables = rows.map((r) => r.t).filter((x) => !ALLOWED_WRITES.has(x) && x !== 'migrations');
  const org = await createOrganization(t.ds, 'manufacturer');
  const other = await createUser(t.ds, org, ['reviewer']);
  ids = [org.id, other.id];
}, 60_000);
afterAll(async () => {
  server?.close();
  await closeTestApp(t);
});

describe('fuzzing every state-changing route', () => {
  it('finds the routes to fuzz', () => {
    expect(listRoutes(t.app).filter((r) => r.method !== 'GET').length).toBeGreaterThan(3);
  });

  const stateChanging = () => {
    // Read lazily: the routes come from the app built in beforeAll.
    return listRoutes(t.app).filter((r) => !['GET', 'HEAD', 'OPTIONS'].includes(r.method));
  };

  it(
    `survives ${RUNS} generated requests per route without a 5xx, a stack trace or a stray write`,
    async () => {
      const failures: string[] = [];
      for (const route of stateChanging()) {
        await fuzzRoute(route, failures);
        if (failures.length > 5) break;
      }
      expect(failures).toEqual([]);
    },
    30 * 60_000,
  );
});

async function fuzzRoute(route: RouteInfo, failures: string[]) {
  const org = await createOrganization(t.ds, 'manufacturer');
  const admin = await createUser(t.ds, org, ['administrator', 'reviewer', 'accountant']);
  const colleague = await createUser(t.ds, org, ['reviewer']);
  ids = [org.id, colleague.id, ...ids.slice(0, 2)];
  // The sign-in fuzzing trips the per-address limit on purpose; each route starts from none.
  await t.ds.query('DELETE FROM login_limits');
  // Sign-out would end the fuzzing session itself: that route is fuzzed without one.
  const cookie = route.path === '/api/auth/logout' ? '' : await signInCookie(admin.email);
  await fc
    .assert(
      fc.asyncProperty(makeRequest(route), async (req) => {
        let i = 0;
        const path = route.path.replace(/:[A-Za-z]+/g, () => encodeURIComponent(req.params[i++] ?? 'x'));
        const qs = new URLSearchParams(req.query).toString();
        const before = await rowCounts();
        const payload = req.raw
          ? String(typeof req.body === 'string' ? req.body : (JSON.stringify(req.body) ?? '')).slice(1)
          : JSON.stringify(req.body ?? null);
        const res = await fetch(`${base}${path}${qs ? `?${qs}` : ''}`, {
          method: route.method,
          headers: { 'content-type': req.contentType, ...(cookie ? { cookie } : {}) },
          body: payload,
        });
        const text = await res.text();
        if (process.env.FUZZ_DEBUG) console.log(route.method, route.path, res.status, text.slice(0, 80));
        const where = `${route.method} ${path} (${req.contentType}) -> ${res.status}`;
        if (res.status >= 500) failures.push(`${where}: ${text.slice(0, 200)}`);
        if (/\n\s+at .+:\d+:\d+/.test(text) || /node_modules|\.ts:\d+/.test(text))
          failures.push(`${where}: stack trace in body`);
        if (res.status >= 400) {
          let shape: { error?: { code?: unknown; message?: unknown } } = {};
          try {
            shape = JSON.parse(text);
          } catch {
            failures.push(`${where}: error body is not JSON`);
          }
          if (typeof shape.error?.code !== 'string' || typeof shape.error?.message !== 'string')
            failures.push(`${where}: error shape`);
          const after = await rowCounts();
          for (const [tb, n] of after)
            if (n !== before.get(tb)) failures.push(`${where}: refused request wrote to ${tb}`);
        }
        return failures.length === 0;
      }),
      { numRuns: RUNS, seed: 20261201 },
    )
    .catch((e) =>
      failures.push(`${route.method} ${route.path}: ${String(e.message).split('\n').slice(0, 3).join(' ')}`),
    );
}
