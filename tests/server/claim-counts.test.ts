import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { STAGES, type Stage } from '../../shared/claims/stages';
import { Claim } from '../../server/db/entities/claim.entity';
import { ClaimCount } from '../../server/db/entities/claim-count.entity';
import { claimCountsDrift, compactClaimCounts } from '../../server/lib/claim-counts';
import { createOrganization, createUser, signIn } from '../support/factories';
import { createClaimAt, createReviewWorld, type ReviewWorld } from '../support/review-factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

// The claim counts the triggers keep (server/lib/claim-counts.ts) against the claims themselves. Other test files
// change claims in this database at the same time, and the counts must agree with them at every moment: each
// check reads both in one statement.

let t: TestContext;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => closeTestApp(t));

const rowsOf = (orgId: string) => t.ds.getRepository(ClaimCount).findBy({ organizationId: orgId });
const totalsOf = async (orgId: string) => {
  const totals: Partial<Record<Stage, number>> = {};
  for (const r of await rowsOf(orgId)) totals[r.stage] = (totals[r.stage] ?? 0) + r.n;
  for (const k of Object.keys(totals) as Stage[]) if (totals[k] === 0) delete totals[k];
  return totals;
};

async function world(): Promise<ReviewWorld> {
  const contractor = await createOrganization(t.ds, 'contractor');
  const manufacturer = await createOrganization(t.ds, 'manufacturer');
  return createReviewWorld(t.ds, contractor, manufacturer);
}

describe('claim counts', () => {
  it('follow every insert, stage move and delete, and nothing of a rolled-back change', async () => {
    const w = await world();
    const repo = t.ds.getRepository(Claim);
    const draft = await createClaimAt(t.ds, w, 'draft');
    const a = await createClaimAt(t.ds, w, 'in_review');
    const b = await createClaimAt(t.ds, w, 'in_review');
    expect(await totalsOf(w.contractor.id)).toEqual({ draft: 1, in_review: 2 });
    expect(await totalsOf(w.manufacturer.id)).toEqual({ draft: 1, in_review: 2 });

    await repo.update({ id: a.id }, { stage: 'approved' });
    // A change that is not a stage move appends nothing.
    const before = (await rowsOf(w.manufacturer.id)).length;
    await repo.update({ id: b.id }, { narrative: 'Second look: the driver case is scorched.' });
    expect((await rowsOf(w.manufacturer.id)).length).toBe(before);
    await repo.delete({ id: draft.id });
    await expect(
      t.ds.transaction(async (m) => {
        await m.getRepository(Claim).update({ id: b.id }, { stage: 'denied' });
        throw new Error('rolled back');
      }),
    ).rejects.toThrow('rolled back');
    expect(await totalsOf(w.contractor.id)).toEqual({ in_review: 1, approved: 1 });
    expect(await totalsOf(w.manufacturer.id)).toEqual({ in_review: 1, approved: 1 });
    expect(await claimCountsDrift(t.ds)).toEqual([]);
  });

  it('fold into one row per organisation and stage, with the same sums', async () => {
    const w = await world();
    const claims = await Promise.all(
      ['filed', 'filed', 'in_review', 'needs_info'].map((s) => createClaimAt(t.ds, w, s as Stage)),
    );
    for (const c of claims) await t.ds.getRepository(Claim).update({ id: c.id }, { stage: 'in_review' });
    const totals = await totalsOf(w.manufacturer.id);
    expect(totals).toEqual({ in_review: 4 });
    expect((await rowsOf(w.manufacturer.id)).length).toBeGreaterThan(1);

    const r = await compactClaimCounts(t.ds);
    // Another compaction may have run at the same moment (servers started by other test files compact too).
    if (r.folded) expect(r.groups).toBeGreaterThan(0);
    const rows = await rowsOf(w.manufacturer.id);
    expect(rows.map((x) => [x.stage, x.n])).toEqual([['in_review', 4]]);
    expect(await totalsOf(w.contractor.id)).toEqual({ in_review: 4 });
    expect(await claimCountsDrift(t.ds)).toEqual([]);
  });

  it('stay exact under concurrent stage moves and compactions, without a deadlock', async () => {
    const w = await world();
    const claims: Claim[] = [];
    for (let i = 0; i < 24; i++) claims.push(await createClaimAt(t.ds, w, 'in_review'));
    // Each claim moves through a few stages in its own transactions, all at once, with compactions running beside.
    const path: Stage[] = ['needs_info', 'in_review', 'approved', 'credited'];
    const moves = claims.map(async (c, i) => {
      for (const stage of i % 2 ? path : [...path].reverse()) {
        await t.ds.transaction(async (m) => m.getRepository(Claim).update({ id: c.id }, { stage }));
      }
    });
    const compactions = Array.from({ length: 4 }, async (_, i) => {
      await new Promise((r) => setTimeout(r, i * 15));
      return compactClaimCounts(t.ds);
    });
    await Promise.all([...moves, ...compactions]);
    const expected = { credited: 12, needs_info: 12 } satisfies Partial<Record<Stage, number>>;
    expect(await totalsOf(w.manufacturer.id)).toEqual(expected);
    expect(await totalsOf(w.contractor.id)).toEqual(expected);
    expect(await claimCountsDrift(t.ds)).toEqual([]);
  });

  it('give the list its total: by stage, open or not, a manufacturer never counting drafts', async () => {
    const w = await world();
    const at: Stage[] = [
      'draft',
      'draft',
      'filed',
      'in_review',
      'in_review',
      'approved',
      'closed',
      'withdrawn',
    ];
    for (const s of at) await createClaimAt(t.ds, w, s);
    const installer = await createUser(t.ds, w.contractor, ['installer']);
    const reviewer = await createUser(t.ds, w.manufacturer, ['reviewer']);
    const ia = t.request();
    const ra = t.request();
    await signIn(ia, installer.email);
    await signIn(ra, reviewer.email);
    const total = async (agent: typeof ia, qs: string) => {
      const res = await agent.get(`/api/claims?pageSize=1&${qs}`);
      expect(res.status).toBe(200);
      return res.body.total as number;
    };
    expect(await total(ia, '')).toBe(8);
    expect(await total(ra, '')).toBe(6);
    expect(await total(ia, 'stage=draft')).toBe(2);
    expect(await total(ra, 'stage=draft')).toBe(0);
    expect(await total(ra, 'stage=in_review,filed')).toBe(3);
    expect(await total(ia, 'open=true')).toBe(6); // draft x2, filed, in_review x2, approved (awaiting its credit)
    expect(await total(ra, 'open=true')).toBe(4);
    expect(await total(ra, 'open=false')).toBe(2); // closed, withdrawn
    expect(await total(ra, 'open=true&stage=closed')).toBe(0);
    expect(await total(ra, 'open=false&stage=closed,approved')).toBe(1);
    // With another filter the total is counted from the claims, and agrees.
    expect(await total(ra, `stage=in_review&productModelId=${w.product.id}`)).toBe(2);
    expect(await total(ra, 'verdict=covered')).toBe(0);
    // Every stage, one at a time, sums to the whole.
    let sum = 0;
    for (const s of STAGES) sum += await total(ia, `stage=${s}`);
    expect(sum).toBe(8);
  });
});
