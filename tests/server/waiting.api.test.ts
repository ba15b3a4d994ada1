import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Claim } from '../../server/db/entities/claim.entity';
import { ReturnAuthorization } from '../../server/db/entities/return-authorization.entity';
import { WaitingRead } from '../../server/db/entities/waiting-read.entity';
import type { Stage } from '../../shared/claims/stages';
import { RETURN_OVERDUE_DAYS, type WaitingItemDto } from '../../shared/schemas/waiting';
import { daysAgo } from '../support/claim-factories';
import { createOrganization, createUser, signIn } from '../support/factories';
import { createClaimAt, createReviewWorld, type ReviewWorld } from '../support/review-factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

let t: TestContext;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => closeTestApp(t));

// createClaimAt draws claim numbers from a small space; with many claims in the test database, draw again.
async function claimAt(w: ReviewWorld, stage: Stage, opts: Parameters<typeof createClaimAt>[3] = {}) {
  for (let attempt = 0; ; attempt++) {
    try {
      return await createClaimAt(t.ds, w, stage, opts);
    } catch (err) {
      if (attempt > 4 || !String((err as Error).message).includes('uq_claims_number')) throw err;
    }
  }
}

async function world() {
  const contractor = await createOrganization(t.ds, 'contractor');
  const manufacturer = await createOrganization(t.ds, 'manufacturer');
  const w = await createReviewWorld(t.ds, contractor, manufacturer);
  const people = {
    installer: await createUser(t.ds, contractor, ['installer']),
    reviewer: await createUser(t.ds, manufacturer, ['reviewer']),
    colleague: await createUser(t.ds, manufacturer, ['reviewer']),
    accountant: await createUser(t.ds, manufacturer, ['accountant']),
  };
  const claims = {
    asked: await claimAt(w, 'needs_info', { reviewerId: people.reviewer.id }),
    mine: await claimAt(w, 'in_review', { assigneeId: people.reviewer.id }),
    theirs: await claimAt(w, 'in_review', { assigneeId: people.colleague.id }),
    approved: await claimAt(w, 'approved', { reviewerId: people.reviewer.id }),
    lateReturn: await claimAt(w, 'return_requested', { reviewerId: people.reviewer.id }),
    recentReturn: await claimAt(w, 'return_requested', { reviewerId: people.reviewer.id }),
  };
  const ra = t.ds.getRepository(ReturnAuthorization);
  await ra.update({ claimId: claims.lateReturn.id }, { shippedOn: daysAgo(RETURN_OVERDUE_DAYS + 5) });
  await ra.update({ claimId: claims.recentReturn.id }, { shippedOn: daysAgo(2) });
  return { w, people, claims };
}

const listOf = async (email: string) => {
  const agent = await signIn(t.request(), email);
  const r = await agent.get('/api/waiting');
  expect(r.status).toBe(200);
  return { agent, body: r.body as { items: WaitingItemDto[]; unread: number } };
};

describe('what waits on me', () => {
  it("lists for each person what needs them, with the place to act, and nobody else's", async () => {
    const { people, claims } = await world();
    const installer = await listOf(people.installer.email);
    expect(installer.body.items.map((i) => [i.kind, i.claimId, i.link])).toEqual([
      ['info_requested', claims.asked.id, `/claims/${claims.asked.id}/workflow`],
    ]);
    expect(installer.body.unread).toBe(1);

    const reviewer = await listOf(people.reviewer.email);
    expect(reviewer.body.items.map((i) => [i.kind, i.claimId]).sort()).toEqual(
      [
        ['assigned_to_review', claims.mine.id],
        ['return_overdue', claims.lateReturn.id],
      ].sort(),
    );
    expect(reviewer.body.items.every((i) => i.link === `/review/${i.claimId}`)).toBe(true);

    const accountant = await listOf(people.accountant.email);
    expect(accountant.body.items.map((i) => [i.kind, i.claimId, i.link])).toEqual([
      ['memo_due', claims.approved.id, '/credits'],
    ]);
  });

  it('keeps read and unread per person; a new event on the claim is unread again', async () => {
    const { people, claims } = await world();
    const reviewer = await listOf(people.reviewer.email);
    const item = reviewer.body.items.find((i) => i.kind === 'assigned_to_review')!;
    const colleague = await signIn(t.request(), people.colleague.email);
    // Someone else's key, or one not on the list, marks nothing.
    expect((await colleague.post('/api/waiting/read').send({ keys: [item.key] })).body.marked).toBe(0);
    const r = await reviewer.agent.post('/api/waiting/read').send({ keys: [item.key, 'memo_due:nothing:0'] });
    expect([r.status, r.body.marked]).toEqual([200, 1]);
    const after = (await reviewer.agent.get('/api/waiting')).body;
    expect(after.unread).toBe(reviewer.body.unread - 1);
    expect(after.items.find((i: WaitingItemDto) => i.key === item.key).read).toBe(true);
    expect(await t.ds.getRepository(WaitingRead).countBy({ itemKey: item.key })).toBe(1);

    await t.ds
      .getRepository(Claim)
      .update({ id: claims.mine.id }, { stageChangedAt: new Date(Date.parse(item.since) + 60_000) });
    const again = (await reviewer.agent.get('/api/waiting')).body.items.find(
      (i: WaitingItemDto) => i.claimId === claims.mine.id,
    );
    expect(again.key).not.toBe(item.key);
    expect(again.read).toBe(false);
  });

  it('refuses a malformed request with 400 and writes nothing', async () => {
    const { people } = await world();
    const { agent } = await listOf(people.reviewer.email);
    for (const body of [{}, { keys: [] }, { keys: 'x' }, { keys: ['k'], extra: 1 }]) {
      expect((await agent.post('/api/waiting/read').send(body)).status, JSON.stringify(body)).toBe(400);
    }
    expect(await t.ds.getRepository(WaitingRead).countBy({ userId: people.reviewer.id })).toBe(0);
  });
});
