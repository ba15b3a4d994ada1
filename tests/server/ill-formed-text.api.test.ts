import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Claim } from '../../server/db/entities/claim.entity';
import { Installation } from '../../server/db/entities/installation.entity';
import { installationPayload } from '../support/catalogue-factories';
import { claimWorld, createDraft, goodClaimFields, member } from '../support/claim-factories';
import { createClaimAt, createReviewWorld } from '../support/review-factories';
import { createOrganization } from '../support/factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

// Issue 13, item 5: a lone UTF-16 surrogate (ill-formed Unicode, which no character encoding can store) in a
// free-text field was a 500. Every string schema refuses it with a 400 that names the field, and nothing changes.
const LONE_HIGH = 'Dark row \uD83D after the storm';
const LONE_LOW = '\uDE00 flicker';

let t: TestContext;
let w: Awaited<ReturnType<typeof claimWorld>>;
beforeAll(async () => {
  t = await createTestApp();
  w = await claimWorld(t);
});
afterAll(() => closeTestApp(t));

function expectFieldRefused(
  r: { status: number; body: { error?: { code: string; details?: unknown } } },
  path: string,
  code = 'validation.failed',
) {
  expect(r.status).toBe(400);
  expect(r.body.error?.code).toBe(code);
  const details = r.body.error?.details as { path: string; message: string }[];
  const hit = details.find((d) => d.path === path);
  expect(hit, JSON.stringify(details)).toBeTruthy();
  expect(hit!.message).toMatch(/character/i);
}

describe('lone surrogates in free text', () => {
  it('refuses one in a claim narrative, on a new draft and on an autosave', async () => {
    const before = await t.ds.getRepository(Claim).count();
    const created = await w.installer.agent
      .post('/api/claims')
      .send({ installationId: w.installation.id, narrative: LONE_HIGH });
    expectFieldRefused(created, 'narrative');
    expect(await t.ds.getRepository(Claim).count()).toBe(before);

    const draft = await createDraft(w.installer.agent, w.installation.id, { narrative: 'fine' });
    const saved = await w.installer.agent
      .patch(`/api/claims/${draft.id}`)
      .send({ version: draft.version, narrative: LONE_LOW });
    expectFieldRefused(saved, 'narrative');
    const row = await t.ds.getRepository(Claim).findOneByOrFail({ id: draft.id });
    expect(row.narrative).toBe('fine');
  });

  it('refuses one in a serial number', async () => {
    const r = await w.installer.agent
      .post('/api/claims')
      .send({ installationId: w.installation.id, ...goodClaimFields('SN-\uDBFF1') });
    expectFieldRefused(r, 'serials.0');
  });

  it("refuses one in an invitation's name", async () => {
    const admin = await member(t, w.conX, ['administrator']);
    const r = await admin.agent
      .post('/api/users/invitations')
      .send({ email: 'surrogate-invitee@example.test', name: `Noor ${LONE_LOW}`, roles: ['installer'] });
    expectFieldRefused(r, 'name');
  });

  it("refuses one in an installation's site name", async () => {
    const before = await t.ds.getRepository(Installation).count();
    const r = await w.installer.agent
      .post('/api/installations')
      .send(installationPayload(w.product.id, { siteName: LONE_HIGH }));
    expectFieldRefused(r, 'siteName');
    expect(await t.ds.getRepository(Installation).count()).toBe(before);
  });

  it('refuses one in the reason for withdrawing a claim', async () => {
    const mfr = await createOrganization(t.ds, 'manufacturer');
    const rw = await createReviewWorld(t.ds, w.conX, mfr);
    const claim = await createClaimAt(t.ds, rw, 'filed', { filedById: w.installer.user.id });
    const r = await w.installer.agent
      .post(`/api/claims/${claim.id}/actions/withdraw`)
      .send({ reason: `Loose wire ${LONE_HIGH}` });
    // A claim move's payload is refused with its own code (DEVELOPERS.md, claim moves).
    expectFieldRefused(r, 'reason', 'claim.invalid_payload');
    const row = await t.ds.getRepository(Claim).findOneByOrFail({ id: claim.id });
    expect(row.stage).toBe('filed');
  });

  it('still takes well-formed text outside the Basic Multilingual Plane (a surrogate pair)', async () => {
    const draft = await createDraft(w.installer.agent, w.installation.id, {
      narrative: 'Lamp \uD83D\uDCA1 dark',
    });
    const row = await t.ds.getRepository(Claim).findOneByOrFail({ id: draft.id });
    expect(row.narrative).toBe('Lamp 💡 dark');
  });
});
