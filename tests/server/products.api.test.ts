import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent } from '../../server/db/entities/audit-event.entity';
import { ProductModel } from '../../server/db/entities/product-model.entity';
import { createOrganization, createUser, signIn } from '../support/factories';
import { createProduct, productPayload } from '../support/catalogue-factories';
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

const countProducts = (manufacturerId: string) =>
  t.ds.getRepository(ProductModel).countBy({ manufacturerId });

describe('product models', () => {
  it('a manufacturer administrator creates a model; the audit log records it', async () => {
    const admin = await member('manufacturer', ['administrator']);
    const body = productPayload();
    const r = await admin.agent.post('/api/products').send(body);
    expect(r.status).toBe(201);
    expect(r.body.product).toMatchObject({
      modelNumber: body.modelNumber,
      manufacturer: { id: admin.org.id, name: admin.org.name },
      ratedInputWatts: 24,
      dimming: '0-10v',
    });
    const audit = await t.ds
      .getRepository(AuditEvent)
      .findOneByOrFail({ entityType: 'ProductModel', entityId: r.body.product.id });
    expect(audit.action).toBe('product.created');
    expect(audit.actorUserId).toBe(admin.user.id);
  });

  it('refuses bad values with a message per field, and writes nothing', async () => {
    const admin = await member('manufacturer', ['administrator']);
    const r = await admin.agent
      .post('/api/products')
      .send(productPayload({ inputVoltsMin: 300, inputVoltsMax: 277, ledStrings: 0 }));
    expect(r.status).toBe(400);
    expect(r.body.error.code).toBe('validation.failed');
    expect(r.body.error.details).toEqual(
      expect.arrayContaining([
        { path: 'ledStrings', message: 'The number of LED strings must be at least 1.' },
        { path: 'inputVoltsMax', message: 'The highest input voltage must be above the lowest.' },
      ]),
    );
    expect(await countProducts(admin.org.id)).toBe(0);
  });

  it('refuses a model number already in the catalogue with 409', async () => {
    const admin = await member('manufacturer', ['administrator']);
    const body = productPayload();
    expect((await admin.agent.post('/api/products').send(body)).status).toBe(201);
    const again = await admin.agent.post('/api/products').send({ ...body, name: 'Another' });
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('product.model_number_taken');
    expect(await countProducts(admin.org.id)).toBe(1);
  });

  it('only a manufacturer administrator may create or edit: reviewers, accountants and contractors get 403', async () => {
    const mfr = await member('manufacturer', ['administrator']);
    const product = await createProduct(t.ds, mfr.org);
    const others = [
      await member('manufacturer', ['reviewer'], mfr.org),
      await member('manufacturer', ['accountant'], mfr.org),
      await member('contractor', ['installer']),
      await member('contractor', ['administrator']),
    ];
    for (const o of others) {
      expect((await o.agent.post('/api/products').send(productPayload())).status).toBe(403);
      expect((await o.agent.patch(`/api/products/${product.id}`).send({ name: 'Hijacked' })).status).toBe(
        403,
      );
    }
    // Another manufacturer's administrator can read the public catalogue entry, so is refused with 403, not 404.
    const rival = await member('manufacturer', ['administrator']);
    expect((await rival.agent.patch(`/api/products/${product.id}`).send({ name: 'Hijacked' })).status).toBe(
      403,
    );
    expect((await t.ds.getRepository(ProductModel).findOneByOrFail({ id: product.id })).name).toBe(
      product.name,
    );
    expect(await countProducts(mfr.org.id)).toBe(1);
  });

  it('every signed-in user can browse the catalogues; nobody signed out can', async () => {
    const mfr = await member('manufacturer', ['administrator']);
    const product = await createProduct(t.ds, mfr.org);
    const installer = await member('contractor', ['installer']);
    const r = await installer.agent.get(`/api/products/${product.id}`);
    expect(r.status).toBe(200);
    expect(r.body.product.modelNumber).toBe(product.modelNumber);
    const list = await installer.agent.get(`/api/products?manufacturerId=${mfr.org.id}`);
    expect(list.body).toMatchObject({ total: 1, page: 1, pageSize: 50 });
    expect((await t.request().get('/api/products')).status).toBe(401);
    expect((await installer.agent.get('/api/products/00000000-0000-4000-8000-000000000000')).status).toBe(
      404,
    );
  });

  it('edits keep every bound (cross-field too), bump the version and appear in the history', async () => {
    const admin = await member('manufacturer', ['administrator']);
    const product = await createProduct(t.ds, admin.org);
    const bad = await admin.agent.patch(`/api/products/${product.id}`).send({ inputVoltsMin: 347 });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details).toEqual([
      { path: 'inputVoltsMax', message: 'The highest input voltage must be above the lowest.' },
    ]);
    const ok = await admin.agent
      .patch(`/api/products/${product.id}`)
      .send({ location: 'wet', ambientMaxC: 50 });
    expect(ok.status).toBe(200);
    expect(ok.body.product).toMatchObject({ location: 'wet', ambientMaxC: 50, version: 2 });
    const history = await admin.agent.get(`/api/products/${product.id}/history`);
    expect(history.body.items).toHaveLength(1);
    expect(history.body.items[0]).toMatchObject({
      action: 'product.updated',
      before: { location: 'damp', ambientMaxC: 45 },
      after: { location: 'wet', ambientMaxC: 50 },
      actor: { name: admin.user.name, organization: admin.org.name },
    });
    // Someone from another organisation sees the organisation, not the person.
    const outsider = await member('contractor', ['installer']);
    const seen = await outsider.agent.get(`/api/products/${product.id}/history`);
    expect(seen.body.items[0].actor).toEqual({ name: admin.org.name, organization: admin.org.name });
  });

  it('filters, searches and sorts on the server', async () => {
    const admin = await member('manufacturer', ['administrator']);
    await createProduct(t.ds, admin.org, {
      modelNumber: 'ZZ-WP-1',
      name: 'Wall pack one',
      family: 'wall_pack',
      location: 'wet',
      ratedInputWatts: 40,
      ledStrings: 4,
      ledsPerString: 10,
      driverOutputAmps: 0.9,
    });
    await createProduct(t.ds, admin.org, {
      modelNumber: 'ZZ-HB-2',
      name: 'High-bay two',
      family: 'high_bay',
      ratedInputWatts: 150,
      ledStrings: 24,
      driverOutputAmps: 2.8,
    });
    await createProduct(t.ds, admin.org, {
      modelNumber: 'ZZ-HB-3',
      name: 'High-bay three',
      family: 'high_bay',
      ratedInputWatts: 100,
      ledStrings: 24,
      driverOutputAmps: 1.8,
    });
    const base = `/api/products?manufacturerId=${admin.org.id}`;
    const hb = await admin.agent.get(`${base}&family=high_bay&sort=-ratedInputWatts`);
    expect(hb.body.items.map((p: { modelNumber: string }) => p.modelNumber)).toEqual(['ZZ-HB-2', 'ZZ-HB-3']);
    const wet = await admin.agent.get(`${base}&location=wet`);
    expect(wet.body.total).toBe(1);
    const q = await admin.agent.get(`${base}&q=three`);
    expect(q.body.items.map((p: { modelNumber: string }) => p.modelNumber)).toEqual(['ZZ-HB-3']);
    const bad = await admin.agent.get(`${base}&sort=price`);
    expect(bad.status).toBe(400);
  });

  it('a list runs the same number of queries whatever the page size', async () => {
    const admin = await member('manufacturer', ['administrator']);
    for (let i = 0; i < 12; i++) await createProduct(t.ds, admin.org);
    const run = (size: number) =>
      t.countQueries(() => admin.agent.get(`/api/products?manufacturerId=${admin.org.id}&pageSize=${size}`));
    const small = await run(2);
    const large = await run(12);
    expect(small.result.body.items).toHaveLength(2);
    expect(large.result.body.items).toHaveLength(12);
    expect(large.counter.count).toBe(small.counter.count);
  });
});
