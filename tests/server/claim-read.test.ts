import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Claim } from '../../server/db/entities/claim.entity';
import { InstallationUnit } from '../../server/db/entities/installation-unit.entity';
import { User } from '../../server/db/entities/user.entity';
import { createClaimsService } from '../../server/modules/claims/claims.service';
import { createOrganization, createUser } from '../support/factories';
import { createClaimAt, createReviewWorld } from '../support/review-factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

// A claim read with written-out SQL and TypeORM's metadata (server/db/hydrate.ts) is the very object TypeORM's
// query builder makes of the same joins: every column converted alike (dates, JSON, simple arrays, decimals).

let t: TestContext;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => closeTestApp(t));

const byQueryBuilder = async (id: string) => {
  const c = await t.ds
    .createQueryBuilder(Claim, 'c')
    .leftJoinAndSelect('c.contractor', 'co')
    .leftJoinAndSelect('c.manufacturer', 'mo')
    .leftJoinAndSelect('c.productModel', 'p')
    .leftJoinAndSelect('c.installation', 'i')
    .leftJoinAndSelect('i.units', 'u')
    .leftJoinAndSelect('c.policyVersion', 'v')
    .leftJoinAndSelect('v.policy', 'pol')
    .where('c.id = :id', { id })
    .orderBy('u.id')
    .getOne();
  return c;
};

/** The loaded claim less what only this read adds (its creator), to compare with the query builder's. */
const withoutCreator = (c: Awaited<ReturnType<ReturnType<typeof createClaimsService>['findById']>>) => {
  if (!c) return c;
  const { creator: _creator, ...rest } = c;
  return Object.assign(Object.create(Claim.prototype) as Claim, rest);
};

describe('reading a claim for its page', () => {
  it('gives what the query builder gives, at every kind of stage, with and without units and a policy', async () => {
    const w = await createReviewWorld(
      t.ds,
      await createOrganization(t.ds, 'contractor'),
      await createOrganization(t.ds, 'manufacturer'),
    );
    const service = createClaimsService(t.ds, { publicUrl: (p) => p });
    const claims = [];
    const installer = await createUser(t.ds, w.contractor, ['installer']);
    for (const stage of ['draft', 'in_review', 'approved'] as const)
      claims.push(
        await createClaimAt(t.ds, w, stage, stage === 'in_review' ? { filedById: installer.id } : {}),
      );
    expect(claims[1].createdById).toBe(installer.id);
    // No units on the installation yet: the units list is empty, not missing.
    const lonely = await service.findById(claims[0].id);
    expect(lonely!.installation.units).toEqual([]);
    expect(withoutCreator(lonely)).toEqual(await byQueryBuilder(claims[0].id));

    const units = t.ds.getRepository(InstallationUnit);
    for (const serial of ['SN-A1', 'SN-A2', 'SN-A3'])
      await units.save(
        units.create({
          installationId: w.installation.id,
          productModelId: w.product.id,
          manufacturerId: w.manufacturer.id,
          serial: `${serial}-${w.installation.id.slice(0, 6)}`,
        }),
      );
    // And a claim without a policy version.
    await t.ds.getRepository(Claim).update({ id: claims[2].id }, { policyVersionId: null });
    for (const c of claims) {
      const fast = await service.findById(c.id);
      expect(fast).toBeInstanceOf(Claim);
      expect(fast!.installation.units).toHaveLength(3);
      expect(withoutCreator(fast)).toEqual(await byQueryBuilder(c.id));
      // Who started it comes with it: the user's name and organisation, or null when nobody is recorded.
      const creator = c.createdById
        ? await t.ds.getRepository(User).findOneByOrFail({ id: c.createdById })
        : null;
      expect(fast!.creator).toEqual(
        creator ? { id: creator.id, name: creator.name, organizationId: creator.organizationId } : null,
      );
      // Inside a transaction, on the transaction's connection, the same.
      expect(await t.ds.transaction((m) => service.findById(c.id, m))).toEqual(fast);
    }
    expect((await service.findById(claims[2].id))!.policyVersion).toBeNull();
    expect(await service.findById('00000000-0000-4000-8000-000000000000')).toBeNull();
  });
});
