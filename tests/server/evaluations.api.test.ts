import fs from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ENGINE_VERSION, evaluateClaim, evaluationInputSchema } from '../../shared/engine';
import { createOrganization, createUser, signIn } from '../support/factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

let t: TestContext;
const valid = JSON.parse(fs.readFileSync('tests/shared/engine/fixtures/valid-claim.json', 'utf8'));
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => closeTestApp(t));

describe('POST /api/evaluations', () => {
  it('answers the same evaluation as the engine in code, with its version', async () => {
    const org = await createOrganization(t.ds, 'contractor');
    const user = await createUser(t.ds, org, ['installer']);
    const agent = await signIn(t.request(), user.email);
    const r = await agent.post('/api/evaluations').send(valid);
    expect(r.status).toBe(200);
    expect(r.body.engineVersion).toBe(ENGINE_VERSION);
    expect(r.body).toEqual(JSON.parse(JSON.stringify(evaluateClaim(evaluationInputSchema.parse(valid)))));
  });

  it('answers 400 naming each bad field, and 401 without a session', async () => {
    expect((await t.request().post('/api/evaluations').send(valid)).status).toBe(401);
    const org = await createOrganization(t.ds, 'manufacturer');
    const user = await createUser(t.ds, org, ['reviewer']);
    const agent = await signIn(t.request(), user.email);
    const bad = structuredClone(valid);
    bad.product.ratedInputWatts = 'twenty';
    delete bad.claim.failedOn;
    bad.installation.surprise = true;
    const r = await agent.post('/api/evaluations').send(bad);
    expect(r.status).toBe(400);
    expect(r.body.error.code).toBe('validation.failed');
    const paths = r.body.error.details.map((d: { path: string }) => d.path);
    expect(paths).toEqual(
      expect.arrayContaining(['product.ratedInputWatts', 'claim.failedOn', 'installation']),
    );
  });
});
