import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Claim } from '../../server/db/entities/claim.entity';
import { Organization } from '../../server/db/entities/organization.entity';
import { clock } from '../../server/lib/clock';
import { bucketOf } from '../../shared/schemas/ageing';
import { createOrganization, createUser, signIn } from '../support/factories';
import { createClaimAt, createReviewWorld, type ReviewWorld } from '../support/review-factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

let t: TestContext;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => closeTestApp(t));

const DAY = 86_400_000;

async function claimAt(w: ReviewWorld, assigneeId: string | null) {
  for (let i = 0; ; i++) {
    try {
      return await createClaimAt(t.ds, w, 'in_review', { assigneeId });
    } catch (err) {
      if (i > 4 || !String((err as Error).message).includes('uq_claims_number')) throw err;
    }
  }
}

describe('ageing of open claims', () => {
  it('puts whole days waited into the buckets 0-7, 8-14, 15-30 and over 30 (issue 18)', () => {
    // The bucket edges as the issue states them; common practice, no published source.
    expect([0, 7, 8, 14, 15, 30, 31, 400].map(bucketOf)).toEqual([
      '0-7',
      '0-7',
      '8-14',
      '8-14',
      '15-30',
      '15-30',
      '>30',
      '>30',
    ]);
  });

  it('counts by stage and reviewer, flags claims past the target, and exports the same view as CSV', async () => {
    const contractor = await createOrganization(t.ds, 'contractor');
    const manufacturer = await createOrganization(t.ds, 'manufacturer');
    const w = await createReviewWorld(t.ds, contractor, manufacturer);
    const admin = await createUser(t.ds, manufacturer, ['administrator']);
    const reviewer = await createUser(t.ds, manufacturer, ['reviewer']);
    const ages = [0, 7, 8, 14, 15, 30, 31, 45];
    for (const [i, days] of ages.entries()) {
      const c = await claimAt(w, i % 2 ? reviewer.id : null);
      // Half a day past the whole days, so the count does not hang on the test's own timing.
      await t.ds
        .getRepository(Claim)
        .update({ id: c.id }, { stageChangedAt: new Date(clock.nowMs() - days * DAY - DAY / 2) });
    }
    const agent = await signIn(t.request(), admin.email);
    const set = await agent.put('/api/ageing/targets').send({ targets: { in_review: 14 } });
    expect(set.status).toBe(200);
    expect(
      (await t.ds.getRepository(Organization).findOneByOrFail({ id: manufacturer.id })).stageTargets,
    ).toEqual({
      in_review: 14,
    });
    const r = await agent.get('/api/ageing');
    expect(r.status).toBe(200);
    const inReview = r.body.byStage.find((s: { stage: string }) => s.stage === 'in_review');
    expect(inReview).toEqual({
      stage: 'in_review',
      target: 14,
      counts: { '0-7': 2, '8-14': 2, '15-30': 2, '>30': 2 },
      total: 8,
      overTarget: 4,
    });
    expect(
      r.body.byReviewer.map((x: { reviewer: string; total: number }) => [x.reviewer, x.total]).sort(),
    ).toEqual(
      [
        [reviewer.name, 4],
        ['Nobody yet', 4],
      ].sort(),
    );
    expect(r.body.overdue.map((c: { days: number }) => c.days)).toEqual([45, 31, 30, 15]);

    const csv = await agent.get('/api/ageing/export');
    expect(csv.status).toBe(200);
    expect(csv.headers['content-type']).toContain('text/csv');
    const lines = csv.text.split('\r\n');
    expect(lines[0]).toBe(
      'section,name,target_days,days_0-7,days_8-14,days_15-30,days_>30,total,over_target',
    );
    expect(lines).toContain('stage,in_review,14,2,2,2,2,8,4');
    // The claims past target, longest first, one line each.
    expect(lines.filter((l) => /,in_review,(45|31|30|15),/.test(l))).toHaveLength(4);
  });

  it('refuses bad targets with 400 and other roles with 403, changing nothing', async () => {
    const manufacturer = await createOrganization(t.ds, 'manufacturer');
    const admin = await createUser(t.ds, manufacturer, ['administrator']);
    const reviewer = await createUser(t.ds, manufacturer, ['reviewer']);
    const agent = await signIn(t.request(), admin.email);
    for (const targets of [{ in_review: 0 }, { in_review: 2.5 }, { draft: 3 }, { in_review: '3' }]) {
      expect((await agent.put('/api/ageing/targets').send({ targets })).status, JSON.stringify(targets)).toBe(
        400,
      );
    }
    const other = await signIn(t.request(), reviewer.email);
    expect((await other.get('/api/ageing')).status).toBe(403);
    expect((await other.put('/api/ageing/targets').send({ targets: { filed: 2 } })).status).toBe(403);
    expect(
      (await t.ds.getRepository(Organization).findOneByOrFail({ id: manufacturer.id })).stageTargets,
    ).toBeNull();
  });
});
