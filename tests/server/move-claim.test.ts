import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Claim } from '../../server/db/entities/claim.entity';
import { User } from '../../server/db/entities/user.entity';
import { moveClaim } from '../../server/modules/claims/move-claim';
import { recipientsOf } from '../../server/modules/claims/recipients';
import { createOrganization, createUser } from '../support/factories';
import { createClaimAt, createReviewWorld, type ReviewWorld } from '../support/review-factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

// The one way to move a claim (server/modules/claims/move-claim.ts) and the one list of who hears of it
// (server/modules/claims/recipients.ts).

let t: TestContext;
let w: ReviewWorld;
beforeAll(async () => {
  t = await createTestApp();
  w = await createReviewWorld(
    t.ds,
    await createOrganization(t.ds, 'contractor'),
    await createOrganization(t.ds, 'manufacturer'),
  );
});
afterAll(() => closeTestApp(t));

const row = (id: string) => t.ds.getRepository(Claim).findOneByOrFail({ id });

describe('moveClaim', () => {
  it('moves on the stage and version it was given; the same snapshot again is a 409 that changes nothing', async () => {
    const claim = await createClaimAt(t.ds, w, 'in_review');
    const moved = await t.ds.transaction((m) => moveClaim(m, claim, 'needs_info'));
    expect(moved).toMatchObject({ stage: 'needs_info', version: claim.version + 1, waitingOn: 'contractor' });
    const after = await row(claim.id);
    expect(after).toMatchObject({ stage: 'needs_info', version: claim.version + 1, waitingOn: 'contractor' });

    // A second reviewer acting on the page they loaded before the first move.
    const stale = t.ds.transaction((m) => moveClaim(m, claim, 'approved'));
    await expect(stale).rejects.toMatchObject({ status: 409, code: 'claim.changed' });
    expect(await row(claim.id)).toEqual(after);
  });

  it('keeps the stage-change time when the stage stays, and writes the move’s own columns', async () => {
    const claim = await createClaimAt(t.ds, w, 'return_requested');
    const moved = await t.ds.transaction((m) =>
      moveClaim(m, claim, 'return_requested', { waitingOn: 'manufacturer', set: { narrative: 'Boxed.' } }),
    );
    expect(moved.stageChangedAt).toEqual(claim.stageChangedAt);
    expect(await row(claim.id)).toMatchObject({
      stage: 'return_requested',
      waitingOn: 'manufacturer',
      narrative: 'Boxed.',
      version: claim.version + 1,
    });
  });
});

describe('recipientsOf', () => {
  it('names the filer or the assigned reviewer alone while active, else the group; intake falls back to administrators', async () => {
    const contractor = await createOrganization(t.ds, 'contractor');
    const manufacturer = await createOrganization(t.ds, 'manufacturer');
    const world = await createReviewWorld(t.ds, contractor, manufacturer);
    const installer = await createUser(t.ds, contractor, ['installer']);
    const conAdmin = await createUser(t.ds, contractor, ['administrator']);
    const filer = await createUser(t.ds, contractor, ['installer']);
    const mfrAdmin = await createUser(t.ds, manufacturer, ['administrator']);
    const accountant = await createUser(t.ds, manufacturer, ['accountant']);
    const claim = await createClaimAt(t.ds, world, 'in_review', { filedById: filer.id, assigneeId: null });
    const emails = async (a: Parameters<typeof recipientsOf>[2], c = claim) =>
      (await recipientsOf(t.ds.manager, c, a)).map((r) => r.email).sort();

    expect(await emails('contractor')).toEqual([filer.email]);
    expect(await emails('contractor_accounts')).toEqual([conAdmin.email, filer.email].sort());
    expect(await emails('accountants')).toEqual([accountant.email]);
    // No reviewer at the manufacturer yet: a new claim goes to its administrators, a move to nobody.
    expect(await emails('intake')).toEqual([mfrAdmin.email]);
    expect(await emails('reviewer')).toEqual([]);

    const r1 = await createUser(t.ds, manufacturer, ['reviewer']);
    const r2 = await createUser(t.ds, manufacturer, ['reviewer']);
    expect(await emails('intake')).toEqual([r1.email, r2.email].sort());
    expect(await emails('reviewer')).toEqual([r1.email, r2.email].sort());
    expect(await emails('reviewer', { ...claim, assignedReviewerId: r2.id })).toEqual([r2.email]);
    expect(await emails({ reviewer: r1.id })).toEqual([r1.email]);

    // The filer left: the contractor's installers and administrators hear instead.
    await t.ds.getRepository(User).update({ id: filer.id }, { status: 'disabled' });
    expect(await emails('contractor')).toEqual([installer.email, conAdmin.email].sort());
  });
});
