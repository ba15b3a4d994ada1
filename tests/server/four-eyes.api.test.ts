import crypto from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent } from '../../server/db/entities/audit-event.entity';
import { Claim } from '../../server/db/entities/claim.entity';
import { CreditMemo } from '../../server/db/entities/credit-memo.entity';
import { Decision } from '../../server/db/entities/decision.entity';
import { User } from '../../server/db/entities/user.entity';
import { createApprovedClaim } from '../support/credit-factories';
import { creditWorld } from '../support/credit-world';
import { createUser, signIn } from '../support/factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

// Issue 13, item 8: four eyes on money. One person may not approve a claim and issue its credit, an administrator
// may not change their own roles, and a credit above the organisation's threshold needs a second accountant.
let t: TestContext;
let w: Awaited<ReturnType<typeof creditWorld>>;
beforeAll(async () => {
  t = await createTestApp();
  w = await creditWorld(t);
});
afterAll(() => closeTestApp(t));

const issue = (agent: typeof w.accountant.agent, claimId: string, key = crypto.randomUUID()) =>
  agent.post(`/api/claims/${claimId}/credits`).set('Idempotency-Key', key).send({});

async function decide(claimId: string, decidedById: string, amount: string) {
  await t.ds.getRepository(Decision).insert({
    claimId,
    currentClaimId: claimId,
    outcome: 'approved',
    resolution: 'credit',
    amount,
    currency: 'USD',
    engineAmount: amount,
    approvedUnits: 1,
    reasonCodes: [],
    note: null,
    overrideReason: null,
    againstEngine: false,
    decidedById,
  } as never);
}

describe('four eyes on money', () => {
  it('refuses the credit to the person who approved the claim, and audits the refusal', async () => {
    // One person with both roles approved it; a colleague accountant may issue it.
    const both = await createUser(t.ds, w.mfr, ['reviewer', 'accountant']);
    const agent = await signIn(t.request(), both.email);
    const claim = await createApprovedClaim(t.ds, { manufacturer: w.mfr, contractor: w.contractor });
    await decide(claim.id, both.id, '192.00');

    const r = await issue(agent, claim.id);
    expect(r.status).toBe(403);
    expect(r.body.error.code).toBe('credit.own_approval');
    expect(await t.ds.getRepository(CreditMemo).countBy({ claimId: claim.id })).toBe(0);
    expect((await t.ds.getRepository(Claim).findOneByOrFail({ id: claim.id })).stage).toBe('approved');
    const refusal = await t.ds
      .getRepository(AuditEvent)
      .findOneBy({ entityId: claim.id, action: 'credit.refused' });
    expect(refusal?.after).toMatchObject({ reason: 'credit.own_approval' });
    expect(refusal?.actorUserId).toBe(both.id);

    expect((await issue(w.accountant.agent, claim.id)).status).toBe(201);
  });

  it('refuses an administrator a change of their own roles, and audits it', async () => {
    const admin = await createUser(t.ds, w.mfr, ['administrator']);
    const agent = await signIn(t.request(), admin.email);
    const r = await agent
      .patch(`/api/users/${admin.id}`)
      .send({ roles: ['administrator', 'reviewer', 'accountant'] });
    expect(r.status).toBe(403);
    expect(r.body.error.code).toBe('user.own_roles');
    expect((await t.ds.getRepository(User).findOneByOrFail({ id: admin.id })).roles).toEqual([
      'administrator',
    ]);
    const refusal = await t.ds
      .getRepository(AuditEvent)
      .findOneBy({ entityId: admin.id, action: 'user.roles_refused' });
    expect(refusal).not.toBeNull();
    // Another administrator may change them.
    const other = await createUser(t.ds, w.mfr, ['administrator']);
    const otherAgent = await signIn(t.request(), other.email);
    const ok = await otherAgent
      .patch(`/api/users/${admin.id}`)
      .send({ roles: ['administrator', 'reviewer'] });
    expect(ok.status).toBe(200);
    // Their own name they may still change.
    expect((await agent.patch(`/api/users/${admin.id}`).send({ name: 'Renamed Admin' })).status).toBe(200);
  });
});
