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

  it('needs a second accountant above the amount the organisation sets', async () => {
    const admin = await createUser(t.ds, w.mfr, ['administrator']);
    const adminAgent = await signIn(t.request(), admin.email);
    const set = await adminAgent
      .patch('/api/organizations/current')
      .send({ creditSecondApprovalAbove: '1000' });
    expect(set.status).toBe(200);
    expect(set.body.organization.creditSecondApprovalAbove).toBe('1000.00');
    expect(
      await t.ds
        .getRepository(AuditEvent)
        .countBy({ entityId: w.mfr.id, action: 'organization.settings_changed' }),
    ).toBe(1);
    // Only the administrator sets it.
    expect(
      (await w.accountant.agent.patch('/api/organizations/current').send({ creditSecondApprovalAbove: null }))
        .status,
    ).toBe(403);

    // At or below the amount: one accountant issues as before.
    const small = await createApprovedClaim(t.ds, {
      manufacturer: w.mfr,
      contractor: w.contractor,
      amount: '1000.00',
    });
    expect((await issue(w.accountant.agent, small.id)).status).toBe(201);

    // Above it: the first accountant's request is an approval, answered 202 and replayed for the same key.
    const big = await createApprovedClaim(t.ds, {
      manufacturer: w.mfr,
      contractor: w.contractor,
      amount: '1000000.00',
    });
    const key = crypto.randomUUID();
    const first = await issue(w.accountant.agent, big.id, key);
    expect(first.status).toBe(202);
    expect(first.body.creditApproval).toMatchObject({
      status: 'awaiting_second_approval',
      amount: '1000000.00',
    });
    const replay = await issue(w.accountant.agent, big.id, key);
    expect(replay.status).toBe(202);
    expect(replay.headers['idempotent-replayed']).toBe('true');
    expect(await t.ds.getRepository(CreditMemo).countBy({ claimId: big.id })).toBe(0);
    expect((await t.ds.getRepository(Claim).findOneByOrFail({ id: big.id })).stage).toBe('approved');

    // The same accountant cannot be the second pair of eyes.
    const again = await issue(w.accountant.agent, big.id);
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('credit.second_approval_required');
    expect(await t.ds.getRepository(AuditEvent).countBy({ entityId: big.id, action: 'credit.refused' })).toBe(
      1,
    );
    expect(await t.ds.getRepository(CreditMemo).countBy({ claimId: big.id })).toBe(0);

    // The credits queue says it is waiting, and for whom.
    const queue = await w.accountant.agent.get('/api/credits/queue');
    const item = queue.body.items.find((i: { claimId: string }) => i.claimId === big.id);
    expect(item.secondApproval).toMatchObject({ approvedBy: { id: w.accountant.user.id }, mine: true });

    // A different accountant approves: the memo is issued, by them.
    const colleague = await createUser(t.ds, w.mfr, ['accountant']);
    const colleagueAgent = await signIn(t.request(), colleague.email);
    const second = await issue(colleagueAgent, big.id);
    expect(second.status).toBe(201);
    const memo = await t.ds.getRepository(CreditMemo).findOneByOrFail({ claimId: big.id });
    expect(memo.issuedById).toBe(colleague.id);
    expect(memo.amount).toBe('1000000.00');
    expect((await t.ds.getRepository(Claim).findOneByOrFail({ id: big.id })).stage).toBe('credited');
    const audit = await t.ds
      .getRepository(AuditEvent)
      .findOneByOrFail({ entityId: big.id, action: 'credit.second_approval' });
    expect(audit.after).toMatchObject({ firstApproverId: w.accountant.user.id });

    await adminAgent.patch('/api/organizations/current').send({ creditSecondApprovalAbove: null });
  });
});
