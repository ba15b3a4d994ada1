import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemo } from '../../server/db/seed/demo';
import { createStorage } from '../../server/lib/storage';
import { Installation } from '../../server/db/entities/installation.entity';
import { Organization } from '../../server/db/entities/organization.entity';
import { ProductModel } from '../../server/db/entities/product-model.entity';
import { WarrantyPolicyVersion } from '../../server/db/entities/warranty-policy-version.entity';
import { WarrantyPolicy } from '../../server/db/entities/warranty-policy.entity';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

let t: TestContext;
beforeAll(async () => {
  t = await createTestApp();
  await seedDemo(t.ds, {
    onlyIfEmpty: false,
    credits: { storage: createStorage(t.config), config: t.config },
  });
});
afterAll(() => closeTestApp(t));

const org = (name: string) => t.ds.getRepository(Organization).findOneByOrFail({ name });

describe('the demo catalogue', () => {
  it('has at least four models for each manufacturer across families and ratings', async () => {
    for (const name of ['Aldercrest Lighting', 'Veltra Luminaires']) {
      const products = await t.ds
        .getRepository(ProductModel)
        .findBy({ manufacturerId: (await org(name)).id });
      expect(products.length).toBeGreaterThanOrEqual(4);
      expect(new Set(products.map((p) => p.family)).size).toBeGreaterThanOrEqual(4);
      expect(products.some((p) => p.location === 'damp')).toBe(true);
      expect(products.some((p) => p.location === 'wet')).toBe(true);
      expect(products.some((p) => !p.enclosedRated)).toBe(true);
      expect(products.some((p) => p.dimming === 'none')).toBe(true);
    }
  });

  it('has a policy line with two versions', async () => {
    const policies = await t.ds
      .getRepository(WarrantyPolicy)
      .find({ where: { manufacturerId: (await org('Aldercrest Lighting')).id } });
    expect(policies.some((p) => p.latestVersionNumber === 2)).toBe(true);
  });

  it('has at least 30 installations for each contractor across locations, enclosures and supplies, each judged by the version in force', async () => {
    for (const name of ['Harborview Electric', 'Copperline Electrical']) {
      const list = await t.ds
        .getRepository(Installation)
        .find({ where: { contractorId: (await org(name)).id }, relations: { policyVersion: true } });
      expect(list.length).toBeGreaterThanOrEqual(30);
      expect(new Set(list.map((i) => i.location)).size).toBe(3);
      expect(new Set(list.map((i) => i.enclosure)).size).toBe(3);
      expect(new Set(list.map((i) => i.nominalSupplyVolts)).size).toBeGreaterThanOrEqual(4);
      expect(new Set(list.map((i) => i.manufacturerId)).size).toBe(2); // both manufacturers
      for (const i of list) {
        const date = i.purchaseDate ?? i.installDate;
        expect(i.policyVersion).not.toBeNull();
        expect(i.policyVersion!.effectiveFrom <= date).toBe(true);
      }
    }
    expect(await t.ds.getRepository(WarrantyPolicyVersion).count()).toBeGreaterThanOrEqual(6);
  });
});
