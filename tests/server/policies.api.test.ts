import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent } from '../../server/db/entities/audit-event.entity';
import { WarrantyPolicyVersion } from '../../server/db/entities/warranty-policy-version.entity';
import { WarrantyPolicy } from '../../server/db/entities/warranty-policy.entity';
import { createOrganization, createUser, signIn } from '../support/factories';
import { createPolicy, createProduct, termsPayload } from '../support/catalogue-factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

let t: TestContext;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => closeTestApp(t));

async function member(
  kind: 'contractor' | 'manufacturer',
  roles: Parameters<typeof createUser>[2],
  org?: Awaited<ReturnType<typeof createOrganization>>,
) {
  const o = org ?? (await createOrganization(t.ds, kind));
  const user = await createUser(t.ds, o, roles);
  return { org: o, user, agent: await signIn(t.request(), user.email) };
}

describe('warranty policies', () => {
  it('a manufacturer administrator creates a policy over its models; version 1 holds the terms', async () => {
    const admin = await member('manufacturer', ['administrator']);
    const a = await createProduct(t.ds, admin.org);
    const b = await createProduct(t.ds, admin.org);
    const r = await admin.agent.post('/api/policies').send({
      name: 'Five-year commercial',
      productModelIds: [a.id, b.id],
      terms: termsPayload({ unitCredit: '96' }),
    });
    expect(r.status).toBe(201);
    expect(r.body.policy).toMatchObject({ name: 'Five-year commercial', latestVersionNumber: 1 });
    expect(r.body.policy.models.map((m: { id: string }) => m.id).sort()).toEqual([a.id, b.id].sort());
    expect(r.body.policy.versions).toHaveLength(1);
    expect(r.body.policy.versions[0]).toMatchObject({
      versionNumber: 1,
      unitCredit: '96.00',
      currency: 'USD',
      labourAllowance: '35.00',
      darkLedFailurePercent: 10,
    });
    const actions = (
      await t.ds
        .getRepository(AuditEvent)
        .findBy({ entityType: 'WarrantyPolicy', entityId: r.body.policy.id })
    ).map((e) => e.action);
    expect(actions.sort()).toEqual(['policy.created', 'policy.version_created']);
  });

  it('refuses a model from another catalogue (400) and one already covered by another policy (409), writing nothing', async () => {
    const admin = await member('manufacturer', ['administrator']);
    const rival = await member('manufacturer', ['administrator']);
    const mine = await createProduct(t.ds, admin.org);
    const theirs = await createProduct(t.ds, rival.org);
    const foreign = await admin.agent
      .post('/api/policies')
      .send({ name: 'P', productModelIds: [mine.id, theirs.id], terms: termsPayload() });
    expect(foreign.status).toBe(400);
    expect(foreign.body.error.details[0].path).toBe('productModelIds');
    await createPolicy(t.ds, admin.org, [mine], [{ effectiveFrom: '2022-01-01' }]);
    const covered = await admin.agent
      .post('/api/policies')
      .send({ name: 'Q', productModelIds: [mine.id], terms: termsPayload() });
    expect(covered.status).toBe(409);
    expect(covered.body.error.code).toBe('policy.model_already_covered');
    expect(await t.ds.getRepository(WarrantyPolicy).countBy({ manufacturerId: admin.org.id })).toBe(1);
  });

  it('editing makes a new version; old versions stay as they were', async () => {
    const admin = await member('manufacturer', ['administrator']);
    const p = await createProduct(t.ds, admin.org);
    const { policy, versions } = await createPolicy(
      t.ds,
      admin.org,
      [p],
      [{ effectiveFrom: '2022-01-01', unitCredit: '80.00' }],
    );
    const r = await admin.agent
      .post(`/api/policies/${policy.id}/versions`)
      .send(termsPayload({ effectiveFrom: '2024-07-01', unitCredit: '96.00', changeNote: 'Higher credit' }));
    expect(r.status).toBe(201);
    expect(r.body.version).toMatchObject({
      versionNumber: 2,
      unitCredit: '96.00',
      changeNote: 'Higher credit',
    });
    expect(r.body.policy.versions.map((v: { unitCredit: string }) => v.unitCredit)).toEqual([
      '80.00',
      '96.00',
    ]);
    const v1 = await t.ds.getRepository(WarrantyPolicyVersion).findOneByOrFail({ id: versions[0].id });
    expect(v1.unitCredit).toBe('80.00');
    const history = await admin.agent.get(`/api/policies/${policy.id}/history`);
    expect(history.body.items.at(-1)).toMatchObject({
      action: 'policy.version_created',
      before: { unitCredit: '80.00' },
      after: { unitCredit: '96.00', versionNumber: 2 },
    });
  });

  it('a new version must take effect after the latest one', async () => {
    const admin = await member('manufacturer', ['administrator']);
    const { policy } = await createPolicy(
      t.ds,
      admin.org,
      [await createProduct(t.ds, admin.org)],
      [{ effectiveFrom: '2024-01-01' }],
    );
    const r = await admin.agent
      .post(`/api/policies/${policy.id}/versions`)
      .send(termsPayload({ effectiveFrom: '2024-01-01' }));
    expect(r.status).toBe(409);
    expect(r.body.error.code).toBe('policy.effective_date_order');
    expect(await t.ds.getRepository(WarrantyPolicyVersion).countBy({ policyId: policy.id })).toBe(1);
  });

  it('editing an old version is refused, by the API (409) and by the database itself', async () => {
    const admin = await member('manufacturer', ['administrator']);
    const { policy, versions } = await createPolicy(
      t.ds,
      admin.org,
      [await createProduct(t.ds, admin.org)],
      [{ effectiveFrom: '2022-01-01' }, { effectiveFrom: '2023-01-01' }],
    );
    const r = await admin.agent
      .patch(`/api/policies/${policy.id}/versions/${versions[0].id}`)
      .send({ unitCredit: '1.00' });
    expect(r.status).toBe(409);
    expect(r.body.error.code).toBe('policy.version_immutable');
    await expect(
      t.ds.query('UPDATE warranty_policy_versions SET unit_credit = 1 WHERE id = ?', [versions[0].id]),
    ).rejects.toThrow(/immutable/);
    await expect(
      t.ds.query('DELETE FROM warranty_policy_versions WHERE id = ?', [versions[0].id]),
    ).rejects.toThrow(/immutable/);
    expect(
      (await t.ds.getRepository(WarrantyPolicyVersion).findOneByOrFail({ id: versions[0].id })).unitCredit,
    ).toBe('96.00');
    // A stranger sees the same 404 as for a missing policy; a reader without rights gets 403.
    const reviewer = await member('manufacturer', ['reviewer'], admin.org);
    expect(
      (await reviewer.agent.patch(`/api/policies/${policy.id}/versions/${versions[0].id}`).send({})).status,
    ).toBe(403);
    expect(
      (
        await admin.agent
          .patch(`/api/policies/${policy.id}/versions/00000000-0000-4000-8000-000000000000`)
          .send({})
      ).status,
    ).toBe(404);
  });

  it('only the manufacturer administrator changes policies; everyone signed in reads them', async () => {
    const admin = await member('manufacturer', ['administrator']);
    const product = await createProduct(t.ds, admin.org);
    const { policy } = await createPolicy(t.ds, admin.org, [product], [{ effectiveFrom: '2022-01-01' }]);
    for (const o of [
      await member('manufacturer', ['reviewer'], admin.org),
      await member('contractor', ['installer']),
      await member('manufacturer', ['administrator']),
    ]) {
      expect((await o.agent.get(`/api/policies/${policy.id}`)).status).toBe(200);
      expect(
        (
          await o.agent
            .post(`/api/policies/${policy.id}/versions`)
            .send(termsPayload({ effectiveFrom: '2030-01-01' }))
        ).status,
      ).toBe(403);
      expect((await o.agent.patch(`/api/policies/${policy.id}`).send({ name: 'Renamed' })).status).toBe(403);
    }
    const installer = await member('contractor', ['installer']);
    expect(
      (
        await installer.agent
          .post('/api/policies')
          .send({ name: 'X', productModelIds: [product.id], terms: termsPayload() })
      ).status,
    ).toBe(403);
    expect(await t.ds.getRepository(WarrantyPolicyVersion).countBy({ policyId: policy.id })).toBe(1);
    expect((await t.ds.getRepository(WarrantyPolicy).findOneByOrFail({ id: policy.id })).name).toBe(
      policy.name,
    );
  });

  it('renames and re-attaches models with an audit row', async () => {
    const admin = await member('manufacturer', ['administrator']);
    const [a, b] = [await createProduct(t.ds, admin.org), await createProduct(t.ds, admin.org)];
    const { policy } = await createPolicy(t.ds, admin.org, [a], [{ effectiveFrom: '2022-01-01' }]);
    const r = await admin.agent
      .patch(`/api/policies/${policy.id}`)
      .send({ name: 'Renamed policy', productModelIds: [a.id, b.id] });
    expect(r.status).toBe(200);
    expect(r.body.policy.models).toHaveLength(2);
    const h = await admin.agent.get(`/api/policies/${policy.id}/history`);
    expect(h.body.items.at(-1)).toMatchObject({
      action: 'policy.updated',
      after: { name: 'Renamed policy' },
    });
  });

  it('a list runs the same number of queries whatever the page size, and filters by model', async () => {
    const admin = await member('manufacturer', ['administrator']);
    const products = [];
    for (let i = 0; i < 6; i++) {
      const p = await createProduct(t.ds, admin.org);
      products.push(p);
      await createPolicy(
        t.ds,
        admin.org,
        [p],
        [{ effectiveFrom: '2022-01-01' }, { effectiveFrom: '2023-01-01' }],
      );
    }
    const run = (size: number) =>
      t.countQueries(() => admin.agent.get(`/api/policies?manufacturerId=${admin.org.id}&pageSize=${size}`));
    const small = await run(1);
    const large = await run(6);
    expect(large.result.body.items).toHaveLength(6);
    expect(large.result.body.items[0].latestVersion.versionNumber).toBe(2);
    expect(large.counter.count).toBe(small.counter.count);
    const byModel = await admin.agent.get(`/api/policies?productModelId=${products[3].id}`);
    expect(byModel.body.total).toBe(1);
    expect(byModel.body.items[0].models[0].id).toBe(products[3].id);
  });
});
