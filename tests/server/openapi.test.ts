import crypto from 'node:crypto';
import { Validator } from '@seriousme/openapi-schema-validator';
import Ajv2020 from 'ajv/dist/2020';
import addFormats from 'ajv-formats';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { listRoutes } from '../../server/lib/routes';
import { OPEN_MARK } from '../../server/openapi/answers';
import { openApiPath } from '../../server/openapi/registry';
import { NOMINAL_SUPPLY_VOLTS } from '../../shared/engine/schema';
import { WEBHOOK_EVENTS, WEBHOOK_SIGNATURE_HEADER } from '../../shared/schemas/webhooks';
import { claimWorld, daysAgo } from '../support/claim-factories';
import { insertClaims, insertInstallations } from '../support/analytics-factories';
import { installationPayload, productPayload, termsPayload } from '../support/catalogue-factories';
import { createApprovedClaim } from '../support/credit-factories';
import { createClaimAt, createReviewWorld } from '../support/review-factories';
import { creditWorld } from '../support/credit-world';
import { createUser, signIn } from '../support/factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

// The OpenAPI document (GET /api/openapi.json) against the router it describes: every route is in it with its
// method, its request and its answer, the document is valid OpenAPI 3.1, and real answers fit the schemas it
// declares (checked with the document's own JSON Schema, not with the zod it was generated from).

type Schema = Record<string, unknown>;
type Operation = {
  operationId: string;
  parameters?: { in: string; name: string; required?: boolean }[];
  requestBody?: { content: Record<string, { schema: Schema }> };
  responses: Record<string, { description: string; content?: Record<string, { schema: Schema }> }>;
  security?: Record<string, string[]>[];
};
type Doc = {
  openapi: string;
  paths: Record<string, Record<string, Operation>>;
  webhooks: Record<string, { post: Operation }>;
  components: { schemas: Record<string, Schema>; securitySchemes: Record<string, Schema> };
};

let t: TestContext;
let doc: Doc;
beforeAll(async () => {
  t = await createTestApp();
  const r = await t.request().get('/api/openapi.json');
  expect(r.status).toBe(200);
  doc = r.body as Doc;
});
afterAll(() => closeTestApp(t));

const routes = () => listRoutes(t.app).filter((r) => r.method !== 'HEAD');
const operation = (method: string, path: string) => doc.paths[openApiPath(path)]?.[method.toLowerCase()];
const successOf = (o: Operation) => Object.keys(o.responses).filter((s) => /^2\d\d$/.test(s));

// Routes that change something without reading a body (the action is the address itself).
const NO_BODY = new Set([
  'POST /api/auth/logout',
  'POST /api/auth/sessions/sign-out-others',
  'POST /api/auth/second-factor/enrollment',
  'POST /api/users/:id/second-factor/reset',
  'POST /api/webhooks/:id/test',
  'POST /api/webhooks/:id/deliveries/:deliveryId/resend',
  // Always refused: a version of a policy's terms is never changed.
  'PATCH /api/policies/:id/versions/:versionId',
]);

// The routes whose handler validates a query with parseQuery (read from the routers); each must document it.
const TAKES_QUERY = [
  'GET /api/users',
  'GET /api/security-events',
  'GET /api/products',
  'POST /api/products/import',
  'GET /api/policies',
  'GET /api/installations',
  'POST /api/installations/import',
  'GET /api/claims',
  'POST /api/claims/batches',
  'GET /api/review/queue',
  'GET /api/review/contractors',
  'GET /api/credits',
  'GET /api/credits/queue',
  'GET /api/credits/export',
  'GET /api/credits/cost',
  'GET /api/credits/journal',
  'GET /api/analytics/life',
  'GET /api/analytics/failure-modes',
  'GET /api/analytics/claims-ageing',
  'GET /api/reserve',
];

describe('the OpenAPI document', () => {
  it('is valid OpenAPI 3.1', async () => {
    const validator = new Validator();
    const result = await validator.validate(structuredClone(doc));
    expect(result.errors ?? []).toEqual([]);
    expect(result.valid).toBe(true);
    expect(validator.version).toBe('3.1');
    expect(doc.openapi).toMatch(/^3\.1\./);
  });

  it('holds every route of the router with its method, and nothing the router lacks', () => {
    const inRouter = routes().map((r) => `${r.method} ${openApiPath(r.path)}`);
    const inDoc = Object.entries(doc.paths).flatMap(([p, ops]) =>
      Object.keys(ops).map((m) => `${m.toUpperCase()} ${p}`),
    );
    expect(inRouter.length).toBeGreaterThan(100);
    expect(inDoc.filter((k) => !inRouter.includes(k))).toEqual([]);
    expect(inRouter.filter((k) => !inDoc.includes(k))).toEqual([]);
  });

  it('gives every route that takes a body its request schema', () => {
    const missing = routes()
      .filter((r) => ['POST', 'PUT', 'PATCH'].includes(r.method))
      .filter((r) => !NO_BODY.has(`${r.method} ${r.path}`))
      .filter((r) => {
        const content = operation(r.method, r.path)!.requestBody?.content ?? {};
        const media = content['application/json'] ?? content['multipart/form-data'];
        return !media?.schema || Object.keys(media.schema).length === 0;
      })
      .map((r) => `${r.method} ${r.path}`);
    expect(missing).toEqual([]);
    // And the ones that take none really say none.
    for (const k of NO_BODY) {
      const [m, p] = k.split(' ');
      expect(operation(m!, p!)!.requestBody, k).toBeUndefined();
    }
  });

  it('documents the query of every route that validates one, and of every paged list', () => {
    const queryOf = (o: Operation) => (o.parameters ?? []).filter((p) => p.in === 'query').map((p) => p.name);
    for (const k of TAKES_QUERY) {
      const [m, p] = k.split(' ');
      expect(
        routes().some((r) => r.method === m && r.path === p),
        `${k} is a route`,
      ).toBe(true);
      expect(queryOf(operation(m!, p!)!).length, k).toBeGreaterThan(0);
    }
    for (const r of routes()) {
      const o = operation(r.method, r.path)!;
      const json = o.responses['200']?.content?.['application/json']?.schema as
        { properties?: Record<string, unknown> } | undefined;
      if (json?.properties?.page && json.properties.pageSize && r.path !== '/api/mailbox') {
        expect(queryOf(o), `${r.method} ${r.path}`).toEqual(expect.arrayContaining(['page', 'pageSize']));
      }
    }
  });

  it('gives every route an answer for its success status, and the error shape for its refusals', () => {
    for (const r of routes()) {
      const k = `${r.method} ${r.path}`;
      const o = operation(r.method, r.path)!;
      const ok = successOf(o);
      expect(ok.length, k).toBeGreaterThan(0);
      for (const s of ok) {
        const content = o.responses[s]!.content;
        if (s === '204' || k === 'PATCH /api/policies/:id/versions/:versionId')
          expect(content, k).toBeUndefined();
        else expect(Object.values(content ?? {})[0]?.schema, `${k} ${s}`).toBeTruthy();
      }
      for (const [s, res] of Object.entries(o.responses)) {
        if (Number(s) >= 400) {
          expect(res.content?.['application/json']?.schema, `${k} ${s}`).toEqual({
            $ref: '#/components/schemas/Error',
          });
        }
      }
    }
    // API.md: { error: { code, message, details? } }
    expect(doc.components.schemas.Error).toMatchObject({ required: ['error'] });
  });

  it('names the session cookie and API tokens as its security schemes, and the headers routes take', () => {
    expect(doc.components.securitySchemes.session).toMatchObject({
      type: 'apiKey',
      in: 'cookie',
      name: 'lp.sid',
    });
    expect(doc.components.securitySchemes.apiToken).toMatchObject({ type: 'http', scheme: 'bearer' });
    expect(operation('GET', '/api/claims')!.security).toEqual([{ session: [] }, { apiToken: [] }]);
    expect(operation('GET', '/api/health')!.security).toEqual([]);
    expect(operation('POST', '/api/api-tokens')!.security).toEqual([{ session: [] }]);
    const header = (m: string, p: string, name: string) =>
      operation(m, p)!.parameters?.find((x) => x.in === 'header' && x.name === name);
    expect(header('POST', '/api/claims/:id/credits', 'Idempotency-Key')).toMatchObject({ required: true });
    expect(header('POST', '/api/claims', 'Idempotency-Key')).toMatchObject({ required: false });
    expect(header('POST', '/api/claims/:id/file', 'Idempotency-Key')).toBeTruthy();
    expect(header('POST', '/api/claims/:id/actions/:action', 'If-Match')).toBeTruthy();
    expect(header('POST', '/api/claims/:id/assign', 'If-Match')).toBeTruthy();
  });

  it('describes each webhook event with its body and the signature header', () => {
    for (const event of WEBHOOK_EVENTS) {
      const hook = doc.webhooks[event]?.post;
      expect(hook, event).toBeTruthy();
      expect(hook!.parameters).toEqual(
        expect.arrayContaining([expect.objectContaining({ in: 'header', name: WEBHOOK_SIGNATURE_HEADER })]),
      );
      const body = hook!.requestBody!.content['application/json']!.schema as {
        properties: { type: { const?: string; enum?: string[] } };
      };
      expect(body.properties.type.const ?? body.properties.type.enum?.[0]).toBe(event);
    }
  });

  it('spells out every answer field by field (none left marked as open)', () => {
    let open = 0;
    let all = 0;
    JSON.stringify(doc.paths, (key, value: unknown) => {
      if (key === 'description' && typeof value === 'string' && value.endsWith(OPEN_MARK)) open++;
      if (key === 'schema') all++;
      return value;
    });
    expect(all).toBeGreaterThan(100);
    // Issue 17: every answer is a real schema; openObject() is only a marker for one not yet written.
    expect(open).toBe(0);
  });

  it('spells out every answer of claims, the review desk, credits, sign-in and the organisation', () => {
    const SPELT_OUT = [
      '/api/claims',
      '/api/review',
      '/api/credits',
      '/api/auth',
      '/api/organizations',
      '/api/users',
      '/api/invitations',
      '/api/security-events',
      '/api/api-tokens',
      '/api/webhooks',
      '/api/saved-views',
      '/api/waiting',
      '/api/mailbox',
    ];
    const open: string[] = [];
    for (const [path, item] of Object.entries(doc.paths)) {
      if (!SPELT_OUT.some((p) => path === p || path.startsWith(`${p}/`))) continue;
      for (const [method, o] of Object.entries(item)) {
        if (JSON.stringify(o.responses).includes(OPEN_MARK)) open.push(`${method.toUpperCase()} ${path}`);
      }
    }
    expect(open).toEqual([]);
  });

  it('names every nominal supply voltage, where a literal of several values is asked or answered', () => {
    const found: unknown[] = [];
    JSON.stringify(doc, (key, value: unknown) => {
      if (key === 'nominalSupplyVolts' && value && typeof value === 'object' && 'enum' in value)
        found.push((value as { enum: unknown }).enum);
      return value;
    });
    // Installation bodies and answers, the evaluation's facts.
    expect(found.length).toBeGreaterThanOrEqual(3);
    for (const e of found) expect(e).toEqual([...NOMINAL_SUPPLY_VOLTS]);
  });

  it('is served without sign-in, cached, with a validator, under the app’s security headers', async () => {
    const r = await t.request().get('/api/openapi.json');
    expect(r.status).toBe(200);
    expect(r.headers['content-type']).toMatch(/^application\/json/);
    expect(r.headers['cache-control']).toBe('public, max-age=300, must-revalidate');
    expect(r.headers['content-security-policy']).toContain("default-src 'self'");
    expect(r.headers['etag']).toMatch(/^"[\w-]+"$/);
    const again = await t.request().get('/api/openapi.json').set('If-None-Match', r.headers['etag']!);
    expect(again.status).toBe(304);
  });
});

describe('real answers fit the schemas the document declares', () => {
  const ajv = new Ajv2020({ strict: false, allErrors: true });
  addFormats(ajv);
  let compiled = false;
  const check = (method: string, path: string, status: number, body: unknown) => {
    if (!compiled) {
      ajv.addSchema({ $id: 'doc', components: doc.components }, 'doc');
      compiled = true;
    }
    const o = operation(method, path)!;
    const schema = o.responses[String(status)]!.content!['application/json']!.schema;
    // Refs point into the document's components: resolve them against the copy registered above.
    const validate = ajv.compile(
      JSON.parse(JSON.stringify(schema).replaceAll('"#/components', '"doc#/components')),
    );
    const ok = validate(body);
    expect(validate.errors ?? [], `${method} ${path} ${status}`).toEqual([]);
    expect(ok).toBe(true);
  };

  it('claims, credit memos, people, products, sessions, what waits, tokens, hooks and refusals', async () => {
    const w = await creditWorld(t);
    const claim = await createApprovedClaim(t.ds, {
      manufacturer: w.mfr,
      contractor: w.contractor,
      amount: '96.00',
    });
    await createApprovedClaim(t.ds, { manufacturer: w.mfr, contractor: w.contractor, amount: null });

    const list = await w.installer.agent.get('/api/claims?pageSize=10');
    expect(list.status).toBe(200);
    expect(list.body.items.length).toBeGreaterThan(0);
    check('GET', '/api/claims', 200, list.body);

    const issued = await w.accountant.agent
      .post(`/api/claims/${claim.id}/credits`)
      .set('Idempotency-Key', crypto.randomUUID())
      .send({});
    expect(issued.status).toBe(201);
    check('POST', '/api/claims/:id/credits', 201, issued.body);

    const memoId = issued.body.creditMemo.id as string;
    for (const who of [w.accountant, w.installer]) {
      const memo = await who.agent.get(`/api/credits/${memoId}`);
      expect(memo.status).toBe(200);
      check('GET', '/api/credits/:id', 200, memo.body);
    }
    const voided = await w.accountant.agent
      .post(`/api/credits/${memoId}/void`)
      .send({ reason: 'Entered twice.' });
    expect(voided.status).toBe(201);
    check('POST', '/api/credits/:id/void', 201, voided.body);
    const memos = await w.accountant.agent.get('/api/credits');
    expect(memos.body.items.length).toBeGreaterThanOrEqual(2);
    check('GET', '/api/credits', 200, memos.body);
    check('GET', '/api/credits/queue', 200, (await w.accountant.agent.get('/api/credits/queue')).body);
    check('GET', '/api/credits/balances', 200, (await w.accountant.agent.get('/api/credits/balances')).body);

    check('GET', '/api/auth/me', 200, (await w.installer.agent.get('/api/auth/me')).body);
    check('GET', '/api/auth/sessions', 200, (await w.installer.agent.get('/api/auth/sessions')).body);
    check(
      'GET',
      '/api/auth/second-factor',
      200,
      (await w.installer.agent.get('/api/auth/second-factor')).body,
    );
    check('GET', '/api/waiting', 200, (await w.accountant.agent.get('/api/waiting')).body);
    const products = await w.installer.agent.get('/api/products?pageSize=5');
    expect(products.body.items.length).toBeGreaterThan(0);
    check('GET', '/api/products', 200, products.body);
    const events = await w.contractorAdmin.agent.get('/api/security-events');
    expect(events.status).toBe(200);
    expect(events.body.items.length).toBeGreaterThan(0);
    check('GET', '/api/security-events', 200, events.body);
    check('GET', '/api/users', 200, (await w.contractorAdmin.agent.get('/api/users')).body);

    const token = await w.contractorAdmin.agent
      .post('/api/api-tokens')
      .send({ name: 'Field tool', roles: ['installer'], expiresInDays: 30 });
    expect(token.status).toBe(201);
    check('POST', '/api/api-tokens', 201, token.body);
    const viaToken = await t.request().get('/api/claims').set('Authorization', `Bearer ${token.body.secret}`);
    expect(viaToken.status).toBe(200);
    check('GET', '/api/claims', 200, viaToken.body);
    check('GET', '/api/api-tokens', 200, (await w.contractorAdmin.agent.get('/api/api-tokens')).body);

    const hook = await w.contractorAdmin.agent
      .post('/api/webhooks')
      .send({ url: 'https://receiver.example.test/hooks', events: ['claim.filed'] });
    expect(hook.status).toBe(201);
    check('POST', '/api/webhooks', 201, hook.body);
    check('GET', '/api/webhooks', 200, (await w.contractorAdmin.agent.get('/api/webhooks')).body);

    // Refusals: a missing record, bad input, no sign-in.
    const missing = await w.accountant.agent.get(`/api/credits/${crypto.randomUUID()}`);
    expect(missing.status).toBe(404);
    check('GET', '/api/credits/:id', 404, missing.body);
    const bad = await w.installer.agent.get('/api/claims?pageSize=0');
    expect(bad.status).toBe(400);
    check('GET', '/api/claims', 400, bad.body);
    const anonymous = await t.request().get('/api/claims');
    expect(anonymous.status).toBe(401);
    check('GET', '/api/claims', 401, anonymous.body);
  });

  it('a claim’s page and workflow, its files, batches, the review desk, the journal and sign-in rules', async () => {
    const w = await claimWorld(t);
    const [s1] = w.installation.serials;
    const csv = [
      'serial,units,failed_on,symptoms,supply_volts,input_watts,power_factor,driver_output_volts,driver_output_amps,water_ingress,narrative',
      `${s1},1,${daysAgo(9)},partly_dark,277,23.4,0.95,48.1,0.44,no,Two strings dark on the east row.`,
      `NOPE-1,1,${daysAgo(8)},dark,277,,,,,no,Completely dark since Monday.`,
    ].join('\n');
    const preview = await w.installer.agent
      .post('/api/claims/batches?dryRun=true')
      .send({ csv, filename: 'failures.csv' });
    expect(preview.status).toBe(200);
    expect(preview.body.errors.length).toBeGreaterThan(0);
    check('POST', '/api/claims/batches', 200, preview.body);
    const made = await w.installer.agent.post('/api/claims/batches').send({ csv, filename: 'failures.csv' });
    expect(made.status).toBe(201);
    check('POST', '/api/claims/batches', 201, made.body);
    const filed = await w.installer.agent.post(`/api/claims/batches/${made.body.batchId}/file`).send({});
    expect(filed.status).toBe(200);
    expect(filed.body.results[0].ok).toBe(true);
    check('POST', '/api/claims/batches/:id/file', 200, filed.body);

    const claimId = filed.body.results[0].claimId as string;
    for (const who of [w.installer, w.reviewer]) {
      const page = await who.agent.get(`/api/claims/${claimId}`);
      expect(page.status).toBe(200);
      expect(page.body.claim.evaluation).not.toBeNull();
      check('GET', '/api/claims/:id', 200, page.body);
      const flow = await who.agent.get(`/api/claims/${claimId}/workflow`);
      expect(flow.status).toBe(200);
      check('GET', '/api/claims/:id/workflow', 200, flow.body);
    }
    const files = await w.installer.agent.get(`/api/claims/${claimId}/attachments`);
    expect(files.status).toBe(200);
    check('GET', '/api/claims/:id/attachments', 200, files.body);

    // Stages whose workflow carries a request, a return authorisation and a decision.
    const rw = await createReviewWorld(t.ds, w.conX, w.mfrA);
    for (const stage of ['needs_info', 'unit_received', 'approved', 'denied'] as const) {
      const at = await createClaimAt(t.ds, rw, stage, { reviewerId: w.reviewer.user.id });
      for (const who of [w.installer, w.reviewer]) {
        const flow = await who.agent.get(`/api/claims/${at.id}/workflow`);
        expect(flow.status, stage).toBe(200);
        const { messages, returns, decision } = flow.body;
        expect(messages.length + returns.length + (decision ? 1 : 0), stage).toBeGreaterThan(0);
        check('GET', '/api/claims/:id/workflow', 200, flow.body);
        check('GET', '/api/claims/:id', 200, (await who.agent.get(`/api/claims/${at.id}`)).body);
      }
    }

    const queue = await w.reviewer.agent.get('/api/review/queue');
    expect(queue.status).toBe(200);
    expect(queue.body.items.length).toBeGreaterThan(0);
    check('GET', '/api/review/queue', 200, queue.body);
    check('GET', '/api/review/summary', 200, (await w.reviewer.agent.get('/api/review/summary')).body);

    // The journal needs a memo and the accounts mapped (invented demo codes).
    const c = await creditWorld(t);
    const approved = await createApprovedClaim(t.ds, {
      manufacturer: c.mfr,
      contractor: c.contractor,
      amount: '48.00',
    });
    const issued = await c.accountant.agent
      .post(`/api/claims/${approved.id}/credits`)
      .set('Idempotency-Key', crypto.randomUUID())
      .send({});
    expect(issued.status).toBe(201);
    const map = await c.accountant.agent.put('/api/credits/accounting-map').send({
      debitAccount: { code: '5410', name: 'Warranty credits' },
      creditAccount: { code: '2440', name: 'Contractor credits payable' },
      journalCode: 'WC',
    });
    expect(map.status).toBe(200);
    const today = new Date().toISOString().slice(0, 10);
    const journal = await c.accountant.agent.get(`/api/credits/journal?from=${daysAgo(30)}&to=${today}`);
    expect(journal.status).toBe(200);
    expect(journal.body.lines.length).toBeGreaterThanOrEqual(2);
    check('GET', '/api/credits/journal', 200, journal.body);

    const rules = await c.contractorAdmin.agent.get('/api/organizations/current/security');
    expect(rules.status).toBe(200);
    check('GET', '/api/organizations/current/security', 200, rules.body);
    const changed = await c.contractorAdmin.agent
      .patch('/api/organizations/current/security')
      .send({ requireSecondFactor: false });
    expect(changed.status).toBe(200);
    check('PATCH', '/api/organizations/current/security', 200, changed.body);
    const mail = await c.contractorAdmin.agent.get('/api/mailbox');
    expect(mail.status).toBe(200);
    check('GET', '/api/mailbox', 200, mail.body);
  });

  it('products, policies, installations, their histories and imports', async () => {
    const w = await creditWorld(t);
    const admin = await signIn(t.request(), (await createUser(t.ds, w.mfr, ['administrator'])).email);

    const made = await admin.post('/api/products').send(productPayload());
    expect(made.status).toBe(201);
    check('POST', '/api/products', 201, made.body);
    const productId = made.body.product.id as string;
    const changed = await admin.patch(`/api/products/${productId}`).send({ name: 'Renamed high bay' });
    expect(changed.status).toBe(200);
    check('PATCH', '/api/products/:id', 200, changed.body);
    check('GET', '/api/products/:id', 200, (await admin.get(`/api/products/${productId}`)).body);
    const productHistory = await admin.get(`/api/products/${productId}/history`);
    expect(productHistory.body.items.length).toBeGreaterThanOrEqual(2);
    check('GET', '/api/products/:id/history', 200, productHistory.body);
    // A dry run with a refused row: the outcome with its error, nothing written.
    const dry = await admin.post('/api/products/import?dryRun=true').send({ rows: [{ model_number: '' }] });
    expect(dry.status).toBe(200);
    expect(dry.body.errors.length).toBeGreaterThan(0);
    check('POST', '/api/products/import', 200, dry.body);

    const policy = await admin
      .post('/api/policies')
      .send({ name: 'Standard terms', productModelIds: [productId], terms: termsPayload() });
    expect(policy.status).toBe(201);
    check('POST', '/api/policies', 201, policy.body);
    const policyId = policy.body.policy.id as string;
    const version = await admin
      .post(`/api/policies/${policyId}/versions`)
      .send(termsPayload({ effectiveFrom: '2025-01-01', changeNote: 'A longer term.' }));
    expect(version.status).toBe(201);
    check('POST', '/api/policies/:id/versions', 201, version.body);
    const renamed = await admin.patch(`/api/policies/${policyId}`).send({ name: 'Standard terms 2025' });
    expect(renamed.status).toBe(200);
    check('PATCH', '/api/policies/:id', 200, renamed.body);
    check('GET', '/api/policies/:id', 200, (await admin.get(`/api/policies/${policyId}`)).body);
    const policies = await admin.get('/api/policies');
    expect(policies.body.items.length).toBeGreaterThan(0);
    check('GET', '/api/policies', 200, policies.body);
    check(
      'GET',
      '/api/policies/:id/history',
      200,
      (await admin.get(`/api/policies/${policyId}/history`)).body,
    );

    const installed = await w.installer.agent.post('/api/installations').send(installationPayload(productId));
    expect(installed.status).toBe(201);
    check('POST', '/api/installations', 201, installed.body);
    const installationId = installed.body.installation.id as string;
    const moved = await w.installer.agent
      .patch(`/api/installations/${installationId}`)
      .send({ ambientC: 55 });
    expect(moved.status).toBe(200);
    check('PATCH', '/api/installations/:id', 200, moved.body);
    for (const who of [w.installer.agent, admin]) {
      const one = await who.get(`/api/installations/${installationId}`);
      expect(one.status).toBe(200);
      check('GET', '/api/installations/:id', 200, one.body);
      const list = await who.get('/api/installations');
      expect(list.body.items.length).toBeGreaterThan(0);
      check('GET', '/api/installations', 200, list.body);
      const history = await who.get(`/api/installations/${installationId}/history`);
      expect(history.body.items.length).toBeGreaterThanOrEqual(2);
      check('GET', '/api/installations/:id/history', 200, history.body);
    }
    const imported = await w.installer.agent
      .post('/api/installations/import?dryRun=true')
      .send({ rows: [{ site_name: 'Only a name' }] });
    expect(imported.status).toBe(200);
    check('POST', '/api/installations/import', 200, imported.body);
  });

  it('life data, failure modes, claims ageing, the reserve and the ageing view', async () => {
    const w = await creditWorld(t);
    const admin = await signIn(
      t.request(),
      (await createUser(t.ds, w.mfr, ['administrator', 'accountant'])).email,
    );
    const product = (await admin.post('/api/products').send(productPayload())).body.product as { id: string };
    const policy = await admin
      .post('/api/policies')
      .send({ name: 'Reserve terms', productModelIds: [product.id], terms: termsPayload() });
    expect(policy.status).toBe(201);
    const productModel = { id: product.id, manufacturerId: w.mfr.id } as Parameters<
      typeof insertInstallations
    >[2];
    const installs = await insertInstallations(t.ds, w.contractor, productModel, [
      {
        installDate: '2024-01-15',
        quantity: 40,
        lot: 'L2401',
        policyVersionId: policy.body.policy.latestVersion.id,
      },
      {
        installDate: '2024-06-15',
        quantity: 40,
        lot: 'L2406',
        policyVersionId: policy.body.policy.latestVersion.id,
      },
    ]);
    await insertClaims(t.ds, installs, [
      { installationId: installs[0]!.id, failedOn: '2024-05-02' },
      { installationId: installs[0]!.id, failedOn: '2024-09-20', units: 2 },
      { installationId: installs[1]!.id, failedOn: '2024-11-03' },
      {
        installationId: installs[1]!.id,
        failedOn: '2025-02-14',
        stage: 'in_review',
        verdict: null,
        waitingOn: 'manufacturer',
      },
    ]);

    const life = await admin.get(`/api/analytics/life?productModelId=${product.id}&asOf=2025-06-01`);
    expect(life.status).toBe(200);
    expect(life.body.fit).not.toBeNull();
    check('GET', '/api/analytics/life', 200, life.body);
    // Too few failures to fit: the answer says why, and still fits the document.
    const lot = await admin.get('/api/analytics/life?lot=L2406&asOf=2024-12-01');
    expect(lot.status).toBe(200);
    expect(lot.body.fit).toBeNull();
    check('GET', '/api/analytics/life', 200, lot.body);
    const modes = await admin.get(
      `/api/analytics/failure-modes?productModelId=${product.id}&asOf=2025-06-01`,
    );
    expect(modes.status).toBe(200);
    expect(modes.body.claims).toBeGreaterThan(0);
    check('GET', '/api/analytics/failure-modes', 200, modes.body);
    const ageing = await admin.get('/api/analytics/claims-ageing?asOf=2025-06-01');
    expect(ageing.status).toBe(200);
    check('GET', '/api/analytics/claims-ageing', 200, ageing.body);
    const reserve = await admin.get('/api/reserve?asOf=2025-06-01');
    expect(reserve.status).toBe(200);
    check('GET', '/api/reserve', 200, reserve.body);

    const view = await admin.get('/api/ageing');
    expect(view.status).toBe(200);
    expect(view.body.byStage.length).toBeGreaterThan(0);
    check('GET', '/api/ageing', 200, view.body);
    const targets = await admin.put('/api/ageing/targets').send({ targets: { in_review: 1, filed: 2 } });
    expect(targets.status).toBe(200);
    check('PUT', '/api/ageing/targets', 200, targets.body);
  });
});
