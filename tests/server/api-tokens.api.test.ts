import crypto from 'node:crypto';
import type supertest from 'supertest';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { ApiToken } from '../../server/db/entities/api-token.entity';
import { AuditEvent } from '../../server/db/entities/audit-event.entity';
import { Claim } from '../../server/db/entities/claim.entity';
import { clock } from '../../server/lib/clock';
import { claimWorld, createDraft, goodClaimFields, member } from '../support/claim-factories';
import { createOrganization, createUser, signIn } from '../support/factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

let t: TestContext;
let world: Awaited<ReturnType<typeof claimWorld>>;
beforeAll(async () => {
  t = await createTestApp();
  world = await claimWorld(t);
}, 60_000);
afterAll(() => closeTestApp(t));
afterEach(() => clock.reset());

async function adminOf(org: Awaited<ReturnType<typeof createOrganization>>) {
  const admin = await createUser(t.ds, org, ['administrator']);
  return { admin, agent: await signIn(t.request(), admin.email) };
}

async function makeToken(
  agent: supertest.Agent,
  body: { name?: string; roles: string[]; expiresInDays?: number },
) {
  const r = await agent.post('/api/api-tokens').send({ name: 'ERP link', expiresInDays: 30, ...body });
  if (r.status !== 201) throw new Error(`token: ${r.status} ${JSON.stringify(r.body)}`);
  return r.body as { apiToken: { id: string; hint: string; state: string }; secret: string };
}

const bearer = (secret: string) => ({ Authorization: `Bearer ${secret}` });

describe('API tokens: administration', () => {
  it('an administrator makes a token; the secret is shown once and only its SHA-256 is stored', async () => {
    const { agent } = await adminOf(world.conX);
    const made = await makeToken(agent, { roles: ['installer'] });
    expect(made.secret).toMatch(/^lpt_[0-9a-f]{32}_[A-Za-z0-9_-]{43}$/);
    expect(made.apiToken).toMatchObject({ state: 'active', roles: ['installer'] });
    expect(made.secret.startsWith(made.apiToken.hint)).toBe(true);

    const row = await t.ds.getRepository(ApiToken).findOneByOrFail({ id: made.apiToken.id });
    expect(row.secretHash).toBe(crypto.createHash('sha256').update(made.secret).digest('hex'));
    const stored = JSON.stringify(await t.ds.query('SELECT * FROM api_tokens WHERE id = ?', [row.id]));
    expect(stored).not.toContain(made.secret.slice(37)); // the random part is nowhere in the row

    const list = await agent.get('/api/api-tokens');
    expect(list.status).toBe(200);
    const listed = list.body.items.find((i: { id: string }) => i.id === row.id);
    expect(listed).toMatchObject({ name: 'ERP link', hint: made.apiToken.hint, lastUsedAt: null });
    expect(JSON.stringify(list.body)).not.toContain(made.secret);

    const audit = await t.ds.getRepository(AuditEvent).findBy({ entityType: 'ApiToken', entityId: row.id });
    expect(audit.map((a) => a.action)).toEqual(['api_token.created']);
    expect(JSON.stringify(audit)).not.toContain(made.secret);
  });

  it('only administrators manage tokens; another organisation’s token is a 404 like a missing one', async () => {
    const { agent } = await adminOf(world.conX);
    const made = await makeToken(agent, { roles: ['installer'] });
    const installer = world.installer.agent;
    expect((await installer.get('/api/api-tokens')).status).toBe(403);
    expect(
      (await installer.post('/api/api-tokens').send({ name: 'x', roles: ['installer'], expiresInDays: 1 }))
        .status,
    ).toBe(403);
    expect((await installer.delete(`/api/api-tokens/${made.apiToken.id}`)).status).toBe(404);

    const other = await adminOf(world.conY);
    const foreign = await other.agent.delete(`/api/api-tokens/${made.apiToken.id}`);
    const missing = await other.agent.delete(`/api/api-tokens/${crypto.randomUUID()}`);
    expect(foreign.status).toBe(404);
    expect(foreign.body).toEqual(missing.body);
    expect((await other.agent.get('/api/api-tokens')).body.items).toEqual([]);
    expect(
      (await t.ds.getRepository(ApiToken).findOneByOrFail({ id: made.apiToken.id })).revokedAt,
    ).toBeNull();
  });

  it('refuses roles the organisation kind does not have, and bad input, writing nothing', async () => {
    const { agent } = await adminOf(world.conX);
    const before = await t.ds.getRepository(ApiToken).count();
    const wrongKind = await agent
      .post('/api/api-tokens')
      .send({ name: 'x', roles: ['accountant'], expiresInDays: 30 });
    expect(wrongKind.status).toBe(422);
    expect(wrongKind.body.error.code).toBe('api_token.role_not_allowed');
    const bad = await agent.post('/api/api-tokens').send({ name: '', roles: [], expiresInDays: 0, extra: 1 });
    expect(bad.status).toBe(400);
    expect(await t.ds.getRepository(ApiToken).count()).toBe(before);
  });
});

describe('API tokens: bearer authentication', () => {
  it('lists claims with the tenancy of a signed-in member; another organisation’s claim is a 404', async () => {
    const { agent } = await adminOf(world.conX);
    const { secret } = await makeToken(agent, { roles: ['installer'] });
    const mine = await createDraft(world.installer.agent, world.installation.id, goodClaimFields('SN-T1'));

    const list = await t.request().get('/api/claims?pageSize=200').set(bearer(secret));
    expect(list.status).toBe(200);
    expect(list.headers['set-cookie']).toBeUndefined();
    expect(list.body.items.map((c: { id: string }) => c.id)).toContain(mine.id);

    // Contractor Y's world: their claim is invisible to contractor X's token.
    const yWorld = await claimWorld(t);
    const theirs = await createDraft(
      yWorld.installer.agent,
      yWorld.installation.id,
      goodClaimFields('SN-T2'),
    );
    const foreign = await t.request().get(`/api/claims/${theirs.id}`).set(bearer(secret));
    const missing = await t.request().get(`/api/claims/${crypto.randomUUID()}`).set(bearer(secret));
    expect(foreign.status).toBe(404);
    expect(foreign.body.error).toEqual(missing.body.error);
    expect((await t.request().get(`/api/claims/${mine.id}`).set(bearer(secret))).status).toBe(200);
  });

  it('acts with the token’s roles only, and names its creator as the author of what it makes', async () => {
    const { admin, agent } = await adminOf(world.conX);
    const { secret, apiToken } = await makeToken(agent, { roles: ['installer'] });
    // The creator is an administrator, the token only an installer: no user administration, no tokens.
    expect((await t.request().get('/api/users').set(bearer(secret))).status).toBe(403);
    expect((await t.request().get('/api/api-tokens').set(bearer(secret))).status).toBe(403);
    // Even an administrator token cannot mint tokens.
    const adminToken = await makeToken(agent, { roles: ['administrator'] });
    expect((await t.request().get('/api/users').set(bearer(adminToken.secret))).status).toBe(200);
    const mint = await t
      .request()
      .post('/api/api-tokens')
      .set(bearer(adminToken.secret))
      .send({ name: 'more', roles: ['administrator'], expiresInDays: 1 });
    expect(mint.status).toBe(403);

    const draft = await t
      .request()
      .post('/api/claims')
      .set(bearer(secret))
      .send({ installationId: world.installation.id, ...goodClaimFields('SN-T3') });
    expect(draft.status).toBe(201);
    const row = await t.ds.getRepository(Claim).findOneByOrFail({ id: draft.body.claim.id });
    expect(row.createdById).toBe(admin.id);
    const created = await t.ds.getRepository(AuditEvent).findOneByOrFail({
      entityType: 'Claim',
      entityId: row.id,
      action: 'claim.created',
    });
    expect(created.actorUserId).toBe(admin.id);
    // The change's audit row and the token's use row share the request id: that names the token.
    const use = await t.ds.getRepository(AuditEvent).findOneByOrFail({
      action: 'api_token.used',
      requestId: created.requestId!,
    });
    expect(use).toMatchObject({ entityType: 'ApiToken', entityId: apiToken.id });
    expect(use.after).toEqual({ method: 'POST', path: '/api/claims' });
  });

  it('a manufacturer token with the reviewer role cannot see the credit queue; an accountant token can', async () => {
    const { agent } = await adminOf(world.mfrA);
    const reviewer = await makeToken(agent, { roles: ['reviewer'] });
    const accountant = await makeToken(agent, { roles: ['accountant'] });
    expect((await t.request().get('/api/credits/queue').set(bearer(reviewer.secret))).status).toBe(403);
    expect((await t.request().get('/api/credits/queue').set(bearer(accountant.secret))).status).toBe(200);
    expect((await t.request().get('/api/claims').set(bearer(reviewer.secret))).status).toBe(200);
  });

  it('refuses expired, revoked, malformed and wrong tokens with 401', async () => {
    const { agent } = await adminOf(world.conX);
    const a = await makeToken(agent, { roles: ['installer'], expiresInDays: 1 });
    const b = await makeToken(agent, { roles: ['installer'] });
    expect((await t.request().get('/api/claims').set(bearer(a.secret))).status).toBe(200);

    clock.advance(86_400_000 + 1000);
    const expired = await t.request().get('/api/claims').set(bearer(a.secret));
    expect(expired.status).toBe(401);
    expect(expired.body.error.code).toBe('auth.invalid_token');
    clock.reset();

    const revoke = await agent.delete(`/api/api-tokens/${b.apiToken.id}`);
    expect(revoke.status).toBe(200);
    expect(revoke.body.apiToken.state).toBe('revoked');
    expect((await t.request().get('/api/claims').set(bearer(b.secret))).status).toBe(401);
    expect(
      (await agent.get('/api/api-tokens')).body.items.find((i: { id: string }) => i.id === b.apiToken.id),
    ).toMatchObject({ state: 'revoked' });

    const forged = `${b.secret.slice(0, 37)}${'A'.repeat(43)}`;
    expect((await t.request().get('/api/claims').set(bearer(forged))).status).toBe(401);
    expect((await t.request().get('/api/claims').set(bearer('lpt_nonsense'))).status).toBe(401);
  });

  it('a token stops when its creator is disabled', async () => {
    const { admin, agent } = await adminOf(world.conX);
    const { secret } = await makeToken(agent, { roles: ['installer'] });
    await t.ds.query("UPDATE users SET status = 'disabled' WHERE id = ?", [admin.id]);
    expect((await t.request().get('/api/claims').set(bearer(secret))).status).toBe(401);
  });

  it('may read who it acts as, but never sign in or out, nor touch passwords, factors or sessions', async () => {
    const { agent } = await adminOf(world.conX);
    const { secret } = await makeToken(agent, { roles: ['installer'] });
    expect((await t.request().get('/api/auth/me').set(bearer(secret))).status).toBe(200);
    for (const [method, path] of [
      ['post', '/api/auth/logout'],
      ['get', '/api/auth/sessions'],
      ['post', '/api/auth/password/change'],
    ] as const) {
      const r = await t.request()[method](path).set(bearer(secret)).send({});
      expect(r.status, path).toBe(403);
      expect(r.body.error.code).toBe('api_token.not_allowed');
    }
  });

  it('records every use in the audit log with its request id, and the last-used time', async () => {
    const { agent } = await adminOf(world.conX);
    const { secret, apiToken } = await makeToken(agent, { roles: ['installer'] });
    const r1 = await t.request().get('/api/claims?stage=draft').set(bearer(secret));
    const r2 = await t.request().get(`/api/claims/${crypto.randomUUID()}`).set(bearer(secret));
    expect([r1.status, r2.status]).toEqual([200, 404]);
    const uses = await t.ds
      .getRepository(AuditEvent)
      .find({ where: { entityId: apiToken.id, action: 'api_token.used' }, order: { id: 'ASC' } });
    expect(uses.map((u) => u.requestId)).toEqual([r1.headers['x-request-id'], r2.headers['x-request-id']]);
    expect(uses[0].after).toEqual({ method: 'GET', path: '/api/claims' });
    const row = await t.ds.getRepository(ApiToken).findOneByOrFail({ id: apiToken.id });
    expect(row.lastUsedAt).not.toBeNull();
  });

  it('needs no same-origin proof without a cookie, but a cookie and a token together still get it', async () => {
    const { agent } = await adminOf(world.conX);
    const { secret } = await makeToken(agent, { roles: ['installer'] });
    const body = { installationId: world.installation.id, ...goodClaimFields('SN-T4') };
    const plain = await t
      .request()
      .post('/api/claims')
      .set(bearer(secret))
      .set('Origin', 'https://elsewhere.example')
      .send(body);
    expect(plain.status).toBe(201);
    const installer = await member(t, world.conX, ['installer']);
    const both = await installer.agent
      .post('/api/claims')
      .set(bearer(secret))
      .set('Origin', 'https://elsewhere.example')
      .send(body);
    expect(both.status).toBe(403);
    expect(both.body.error.code).toBe('request.cross_origin');
  });
});

describe('API tokens: rate limit', () => {
  let limited: TestContext;
  beforeAll(async () => {
    limited = await createTestApp({ API_TOKEN_RATE_PER_MINUTE: '3' });
  });
  afterAll(() => closeTestApp(limited));

  it('answers 429 with Retry-After once a token has used its requests for the minute', async () => {
    const org = await createOrganization(limited.ds, 'contractor');
    const admin = await createUser(limited.ds, org, ['administrator']);
    const agent = await signIn(limited.request(), admin.email);
    const { secret, apiToken } = await makeToken(agent, { roles: ['installer'] });
    const other = await makeToken(agent, { roles: ['installer'] });
    const statuses = [];
    for (let i = 0; i < 4; i++)
      statuses.push((await limited.request().get('/api/claims').set(bearer(secret))).status);
    expect(statuses).toEqual([200, 200, 200, 429]);
    const refused = await limited.request().get('/api/claims').set(bearer(secret));
    expect(refused.body.error.code).toBe('api_token.rate_limited');
    expect(Number(refused.headers['retry-after'])).toBeGreaterThan(0);
    // Per token: another token of the same organisation is untouched.
    expect((await limited.request().get('/api/claims').set(bearer(other.secret))).status).toBe(200);
    // A refused request is not a use: three audit rows for three answered requests.
    expect(
      await limited.ds.getRepository(AuditEvent).countBy({ entityId: apiToken.id, action: 'api_token.used' }),
    ).toBe(3);
  });
});
