import Papa from 'papaparse';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent } from '../../server/db/entities/audit-event.entity';
import { InstallationUnit } from '../../server/db/entities/installation-unit.entity';
import { Installation } from '../../server/db/entities/installation.entity';
import { ProductModel } from '../../server/db/entities/product-model.entity';
import { clock } from '../../server/lib/clock';
import { createOrganization, createUser, signIn } from '../support/factories';
import {
  createPolicy,
  createProduct,
  installationPayload,
  productPayload,
} from '../support/catalogue-factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

let t: TestContext;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => closeTestApp(t));

type Org = Awaited<ReturnType<typeof createOrganization>>;
async function member(
  kind: 'contractor' | 'manufacturer',
  roles: Parameters<typeof createUser>[2],
  org?: Org,
) {
  const o = org ?? (await createOrganization(t.ds, kind));
  const user = await createUser(t.ds, o, roles);
  return { org: o, user, agent: await signIn(t.request(), user.email) };
}

async function world() {
  const mfr = await createOrganization(t.ds, 'manufacturer');
  const product = await createProduct(t.ds, mfr);
  const installer = await member('contractor', ['installer']);
  return { mfr, product, installer };
}

const countInstallations = (contractorId: string) =>
  t.ds.getRepository(Installation).countBy({ contractorId });

describe('installations', () => {
  it('an installer registers an installation; the version in force on the purchase date is recorded', async () => {
    const { mfr, product, installer } = await world();
    const { versions } = await createPolicy(
      t.ds,
      mfr,
      [product],
      [{ effectiveFrom: '2022-01-01' }, { effectiveFrom: '2024-03-01' }],
    );
    // Bought 2024-02-15 (version 1 in force), installed 2024-03-05 (version 2 by then): the purchase date decides.
    const r = await installer.agent
      .post('/api/installations')
      .send(installationPayload(product.id, { purchaseDate: '2024-02-15', installDate: '2024-03-05' }));
    expect(r.status).toBe(201);
    expect(r.body.installation).toMatchObject({
      contractor: { id: installer.org.id },
      manufacturer: { id: mfr.id },
      product: { id: product.id },
      policyVersion: { id: versions[0].id, versionNumber: 1 },
      serialCount: 2,
      fit: [],
    });
    // Without a purchase date the install date decides.
    const r2 = await installer.agent
      .post('/api/installations')
      .send(installationPayload(product.id, { purchaseDate: null, installDate: '2024-03-05' }));
    expect(r2.body.installation.policyVersion.versionNumber).toBe(2);
    // Before any version took effect: none.
    const r3 = await installer.agent
      .post('/api/installations')
      .send(installationPayload(product.id, { purchaseDate: '2021-06-01', installDate: '2021-06-10' }));
    expect(r3.body.installation.policyVersion).toBeNull();
    const audit = await t.ds
      .getRepository(AuditEvent)
      .findOneByOrFail({ entityType: 'Installation', entityId: r.body.installation.id });
    expect(audit.action).toBe('installation.created');
  });

  it('saves conditions that do not fit the ratings, and says why (NFPA 70 (NEC) 410.10(A) for the location)', async () => {
    const { product, installer } = await world(); // damp-rated, not enclosed-rated, 0-10 V, 120-277 V, 45 °C
    const r = await installer.agent.post('/api/installations').send(
      installationPayload(product.id, {
        location: 'wet',
        enclosure: 'enclosed',
        nominalSupplyVolts: 480,
        ambientC: 55,
      }),
    );
    expect(r.status).toBe(201);
    expect(r.body.installation.fit.map((w: { code: string }) => w.code)).toEqual([
      'application.location_wetter_than_rated',
      'application.enclosed_not_rated',
      'application.supply_outside_rating',
      'application.ambient_above_rating',
    ]);
    expect(r.body.installation.fit[0].reference).toBe('NFPA 70 (NEC) Article 100 and 410.10(A)');
  });

  it('refuses a serial already registered for the model with 409 naming it, and writes nothing', async () => {
    const { mfr, product, installer } = await world();
    const first = await installer.agent
      .post('/api/installations')
      .send(installationPayload(product.id, { serials: ['DUP-0001', 'OK-0001'] }));
    expect(first.status).toBe(201);
    const other = await member('contractor', ['installer']);
    const again = await other.agent
      .post('/api/installations')
      .send(installationPayload(product.id, { serials: ['dup-0001', 'OK-0002'] }));
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('installation.duplicate_serial');
    expect(again.body.error.message).toContain('DUP-0001');
    expect(await countInstallations(other.org.id)).toBe(0);
    expect(await t.ds.getRepository(InstallationUnit).countBy({ serial: 'OK-0002' })).toBe(0);
    // The same serial on another model is fine: unique per manufacturer and model.
    const model2 = await createProduct(t.ds, mfr);
    expect(
      (
        await other.agent
          .post('/api/installations')
          .send(installationPayload(model2.id, { serials: ['DUP-0001'] }))
      ).status,
    ).toBe(201);
    // And the database refuses a duplicate on its own, whatever the code does.
    const inst = await t.ds.getRepository(Installation).findOneByOrFail({ contractorId: installer.org.id });
    await expect(
      t.ds.getRepository(InstallationUnit).insert({
        manufacturerId: mfr.id,
        productModelId: product.id,
        installationId: inst.id,
        serial: 'DUP-0001',
      }),
    ).rejects.toThrow(/Duplicate/);
  });

  it('the manufacturer sees the installations of its own products only; others get 404 like a missing record', async () => {
    const { mfr, product, installer } = await world();
    const r = await installer.agent.post('/api/installations').send(installationPayload(product.id));
    const id = r.body.installation.id;
    const reviewer = await member('manufacturer', ['reviewer'], mfr);
    expect((await reviewer.agent.get(`/api/installations/${id}`)).status).toBe(200);
    const list = await reviewer.agent.get('/api/installations');
    expect(list.body.items.map((i: { id: string }) => i.id)).toEqual([id]);

    const missing = await installer.agent.get('/api/installations/00000000-0000-4000-8000-000000000000');
    for (const stranger of [
      await member('manufacturer', ['reviewer']),
      await member('contractor', ['installer']),
      await member('contractor', ['administrator']),
    ]) {
      const seen = await stranger.agent.get(`/api/installations/${id}`);
      expect(seen.status).toBe(404);
      expect(seen.body).toEqual(missing.body);
      expect((await stranger.agent.get(`/api/installations/${id}/history`)).status).toBe(404);
      expect((await stranger.agent.patch(`/api/installations/${id}`).send({ quantity: 99 })).status).toBe(
        404,
      );
      expect((await stranger.agent.get('/api/installations')).body.total).toBe(0);
    }
    // The manufacturer may read, not change; a colleague of the installer may change.
    expect((await reviewer.agent.patch(`/api/installations/${id}`).send({ quantity: 99 })).status).toBe(403);
    expect((await t.ds.getRepository(Installation).findOneByOrFail({ id })).quantity).toBe(4);
    const colleague = await member('contractor', ['administrator'], installer.org);
    expect((await colleague.agent.patch(`/api/installations/${id}`).send({ quantity: 6 })).status).toBe(200);
  });

  it('only contractors register installations', async () => {
    const { mfr, product } = await world();
    for (const o of [
      await member('manufacturer', ['administrator'], mfr),
      await member('manufacturer', ['reviewer'], mfr),
      await member('manufacturer', ['accountant']),
    ]) {
      expect((await o.agent.post('/api/installations').send(installationPayload(product.id))).status).toBe(
        403,
      );
    }
    expect(await t.ds.getRepository(Installation).countBy({ productModelId: product.id })).toBe(0);
  });

  it('refuses bad input with a message per field; an unknown model is a 400 on productModelId', async () => {
    const { product, installer } = await world();
    const r = await installer.agent
      .post('/api/installations')
      .send(installationPayload(product.id, { quantity: 0, hoursPerDay: 30, installDate: '2024-13-01' }));
    expect(r.status).toBe(400);
    const paths = r.body.error.details.map((d: { path: string }) => d.path);
    expect(paths).toEqual(expect.arrayContaining(['quantity', 'hoursPerDay', 'installDate']));
    const unknown = await installer.agent
      .post('/api/installations')
      .send(installationPayload('00000000-0000-4000-8000-000000000000'));
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.details[0].path).toBe('productModelId');
    expect(await countInstallations(installer.org.id)).toBe(0);
  });

  it('edits replace the serials, re-pick the version when the dates change, and show in the history', async () => {
    const { mfr, product, installer } = await world();
    const { versions } = await createPolicy(
      t.ds,
      mfr,
      [product],
      [{ effectiveFrom: '2022-01-01' }, { effectiveFrom: '2024-06-01' }],
    );
    const r = await installer.agent
      .post('/api/installations')
      .send(installationPayload(product.id, { serials: ['ED-1', 'ED-2'] }));
    const id = r.body.installation.id;
    const p = await installer.agent
      .patch(`/api/installations/${id}`)
      .send({ serials: ['ED-1', 'ED-3'], purchaseDate: '2024-07-01', installDate: '2024-07-02' });
    expect(p.status).toBe(200);
    expect(p.body.installation.serials).toEqual(['ED-1', 'ED-3']);
    expect(p.body.installation.policyVersion.id).toBe(versions[1].id);
    const h = await installer.agent.get(`/api/installations/${id}/history`);
    expect(h.body.items.map((e: { action: string }) => e.action)).toEqual([
      'installation.created',
      'installation.updated',
    ]);
    expect(h.body.items[1].after.serials).toEqual(['ED-1', 'ED-3']);
    // A duplicate in an edit is refused and changes nothing.
    const other = await installer.agent
      .post('/api/installations')
      .send(installationPayload(product.id, { serials: ['ED-9'] }));
    const dup = await installer.agent
      .patch(`/api/installations/${other.body.installation.id}`)
      .send({ serials: ['ED-3'], siteName: 'Changed' });
    expect(dup.status).toBe(409);
    const after = await t.ds.getRepository(Installation).findOneByOrFail({ id: other.body.installation.id });
    expect(after.siteName).not.toBe('Changed');
    expect(
      (await t.ds.getRepository(InstallationUnit).findBy({ installationId: after.id })).map((u) => u.serial),
    ).toEqual(['ED-9']);
  });

  it('lists with filters, search and sort, in the same number of queries whatever the page size', async () => {
    const { product, installer } = await world();
    for (let i = 0; i < 10; i++) {
      await installer.agent.post('/api/installations').send(
        installationPayload(product.id, {
          siteName: `Depot ${String(i).padStart(2, '0')}`,
          location: i % 2 ? 'damp' : 'dry',
          installDate: `2024-01-${String(i + 1).padStart(2, '0')}`,
          serials: [`LS-${i}-${product.id.slice(0, 6)}`],
        }),
      );
    }
    const run = (size: number) =>
      t.countQueries(() => installer.agent.get(`/api/installations?pageSize=${size}`));
    const small = await run(2);
    const large = await run(10);
    expect(large.result.body.items).toHaveLength(10);
    expect(large.counter.count).toBe(small.counter.count);
    // The total rides on the page's rows; a page past the end asks for it on its own (server/db/read.ts).
    const pages = await Promise.all(
      [1, 3, 40].map((page) =>
        installer.agent.get(`/api/installations?pageSize=4&page=${page}&location=damp`),
      ),
    );
    expect(pages.map((r) => [r.body.items.length, r.body.total])).toEqual([
      [4, 5],
      [0, 5],
      [0, 5],
    ]);
    const damp = await installer.agent.get('/api/installations?location=damp&sort=siteName');
    expect(damp.body.items.map((i: { siteName: string }) => i.siteName)).toEqual([
      'Depot 01',
      'Depot 03',
      'Depot 05',
      'Depot 07',
      'Depot 09',
    ]);
    const bySerial = await installer.agent.get(`/api/installations?q=LS-7-`);
    expect(bySerial.body.items.map((i: { siteName: string }) => i.siteName)).toEqual(['Depot 07']);
    expect((await installer.agent.get('/api/installations?nominalSupplyVolts=230')).status).toBe(400);
  });

  it("lists by each filter, pages with the total, counts serials, matches wildcards literally, and never lists another organisation's", async () => {
    const { mfr, product, installer } = await world();
    const other = await createProduct(t.ds, mfr);
    const otherMfr = await createOrganization(t.ds, 'manufacturer');
    const foreign = await createProduct(t.ds, otherMfr);
    const add = async (
      who: typeof installer,
      productModelId: string,
      extra: Parameters<typeof installationPayload>[1],
    ) => {
      const r = await who.agent.post('/api/installations').send(installationPayload(productModelId, extra));
      expect(r.status).toBe(201);
      return r.body.installation.id as string;
    };
    const a = await add(installer, product.id, {
      siteName: '100% LED hall',
      location: 'damp',
      enclosure: 'enclosed',
      nominalSupplyVolts: 120,
      installDate: '2024-01-03',
      serials: [],
    });
    const b = await add(installer, other.id, {
      siteName: 'Bay_2 store',
      location: 'wet',
      enclosure: 'open',
      nominalSupplyVolts: 277,
      installDate: '2024-01-02',
      serials: ['BQ-1', 'BQ-2', 'BQ-3'],
    });
    const c = await add(installer, foreign.id, {
      siteName: 'Bay 2 yard',
      location: 'dry',
      enclosure: 'enclosed_ventilated',
      nominalSupplyVolts: 347,
      installDate: '2024-01-01',
      serials: ['CQ-1'],
    });
    // Another contractor's installation of the same model: never in this installer's list.
    const rival = await member('contractor', ['installer']);
    const d = await add(rival, product.id, { siteName: '100% rival site', location: 'damp' });

    const ids = async (who: typeof installer, query: string) => {
      const r = await who.agent.get(`/api/installations?${query}`);
      expect(r.status).toBe(200);
      return { ids: r.body.items.map((i: { id: string }) => i.id), total: r.body.total, items: r.body.items };
    };
    expect((await ids(installer, '')).ids).toEqual([a, b, c]);
    expect((await ids(installer, `productModelId=${other.id}`)).ids).toEqual([b]);
    expect((await ids(installer, `manufacturerId=${otherMfr.id}`)).ids).toEqual([c]);
    expect((await ids(installer, `contractorId=${installer.org.id}`)).ids).toEqual([a, b, c]);
    expect((await ids(installer, `contractorId=${rival.org.id}`)).total).toBe(0);
    expect((await ids(installer, 'location=wet')).ids).toEqual([b]);
    expect((await ids(installer, 'enclosure=enclosed_ventilated')).ids).toEqual([c]);
    expect((await ids(installer, 'nominalSupplyVolts=120')).ids).toEqual([a]);
    // Paging: the total is of all matches, whatever the page.
    const page2 = await ids(installer, 'pageSize=2&page=2');
    expect(page2).toMatchObject({ ids: [c], total: 3 });
    expect((await ids(installer, 'pageSize=2&page=3')).ids).toEqual([]);
    expect((await ids(installer, 'pageSize=2&page=3')).total).toBe(3);
    // % and _ in the search are the characters themselves, not LIKE wildcards.
    expect((await ids(installer, `q=${encodeURIComponent('100%')}`)).ids).toEqual([a]);
    expect((await ids(installer, 'q=Bay_2')).ids).toEqual([b]);
    expect((await ids(installer, `q=${encodeURIComponent('%')}`)).ids).toEqual([a]);
    // The serial count of each listed installation.
    const all = await ids(installer, 'sort=siteName');
    expect(all.items.map((i: { id: string; serialCount: number }) => [i.id, i.serialCount])).toEqual([
      [a, 0],
      [c, 1],
      [b, 3],
    ]);
    // The manufacturer lists its own products' installations only, from every contractor.
    const reviewer = await member('manufacturer', ['reviewer'], mfr);
    expect((await ids(reviewer, 'sort=siteName')).ids).toEqual([a, d, b]);
    expect((await ids(reviewer, `q=${encodeURIComponent('100%')}&contractorId=${rival.org.id}`)).ids).toEqual(
      [d],
    );
  });
});

describe('spreadsheet import', () => {
  it('installations: a preview marks each bad row by row, column and reason, writes nothing; the import writes the good rows', async () => {
    const { mfr, product, installer } = await world();
    await installer.agent
      .post('/api/installations')
      .send(installationPayload(product.id, { serials: ['TAKEN-1'] }));
    const header =
      'manufacturer,model_number,site_name,site_address,site_city,site_region,site_postal_code,quantity,serials,install_date,purchase_date,distributor,invoice_number,location,enclosure,dimmer,nominal_supply_volts,hours_per_day,ambient_c';
    const row = (over: Record<string, string>) => {
      const base: Record<string, string> = {
        manufacturer: mfr.name,
        model_number: product.modelNumber,
        site_name: 'Bay',
        site_address: '1 Road',
        site_city: 'Town',
        site_region: 'WA',
        site_postal_code: '98000',
        quantity: '2',
        serials: '',
        install_date: '2024-04-01',
        purchase_date: '',
        distributor: '',
        invoice_number: '',
        location: 'dry',
        enclosure: 'open',
        dimmer: 'none',
        nominal_supply_volts: '277',
        hours_per_day: '12',
        ambient_c: '20',
      };
      return header
        .split(',')
        .map((k) => over[k] ?? base[k])
        .join(',');
    };
    const csv = [
      header,
      row({ site_name: 'Good one', serials: 'IMP-1;IMP-2' }), // row 2
      row({ quantity: 'lots' }), // row 3: not a number
      row({ model_number: 'NOPE-404' }), // row 4: unknown model
      row({ site_name: 'Good two', location: 'wet', serials: 'IMP-3' }), // row 5: misfit but valid
      row({ serials: 'TAKEN-1' }), // row 6: already registered
      row({ serials: 'IMP-3' }), // row 7: duplicate of row 5
      row({ install_date: '2024-02-31', nominal_supply_volts: '230' }), // row 8: two bad cells
    ].join('\n');
    const before = await countInstallations(installer.org.id);
    const preview = await installer.agent.post('/api/installations/import?dryRun=true').send({ csv });
    expect(preview.status).toBe(200);
    expect(preview.body).toMatchObject({ dryRun: true, total: 7, valid: 2, invalid: 5, imported: 0 });
    expect(preview.body.errors).toEqual([
      { row: 3, column: 'quantity', message: '"lots" is not a number.' },
      {
        row: 4,
        column: 'model_number',
        message: `No model numbered NOPE-404 from ${mfr.name} in the catalogue.`,
      },
      { row: 6, column: 'serials', message: 'Already registered for this model: TAKEN-1.' },
      { row: 7, column: 'serials', message: 'Also on an earlier row: IMP-3 (row 5).' },
      { row: 8, column: 'install_date', message: 'The install date is not a calendar date.' },
      {
        row: 8,
        column: 'nominal_supply_volts',
        message: 'Pick a nominal supply: 120, 208, 240, 277, 347 or 480 V.',
      },
    ]);
    expect(await countInstallations(installer.org.id)).toBe(before);

    const done = await installer.agent.post('/api/installations/import').send({ csv });
    expect(done.status).toBe(201);
    expect(done.body).toMatchObject({ dryRun: false, imported: 2 });
    expect(await countInstallations(installer.org.id)).toBe(before + 2);
    const good = await t.ds
      .getRepository(Installation)
      .findOneByOrFail({ contractorId: installer.org.id, siteName: 'Good one' });
    expect(
      (await t.ds.getRepository(InstallationUnit).findBy({ installationId: good.id }))
        .map((u) => u.serial)
        .sort(),
    ).toEqual(['IMP-1', 'IMP-2']);
    expect(
      await t.ds
        .getRepository(AuditEvent)
        .countBy({ entityType: 'Installation', entityId: good.id, action: 'installation.imported' }),
    ).toBe(1);
  });

  it('a file with a wrong header is refused as a whole and nothing is written', async () => {
    const { installer } = await world();
    const r = await installer.agent.post('/api/installations/import').send({ csv: 'model,site\nA,B\n' });
    expect(r.status).toBe(200);
    expect(r.body.imported).toBe(0);
    expect(r.body.errors[0]).toMatchObject({ row: 1 });
    expect(await countInstallations(installer.org.id)).toBe(0);
  });

  it('products: manufacturers import JSON rows or CSV; a contractor may not', async () => {
    const admin = await member('manufacturer', ['administrator']);
    const p = productPayload();
    const good = Object.fromEntries(
      Object.entries({
        model_number: p.modelNumber,
        name: p.name,
        family: p.family,
        rated_input_watts: p.ratedInputWatts,
        input_volts_min: p.inputVoltsMin,
        input_volts_max: p.inputVoltsMax,
        rated_lumens: p.ratedLumens,
        led_strings: p.ledStrings,
        leds_per_string: p.ledsPerString,
        led_forward_volts: p.ledForwardVolts,
        driver_output_amps: p.driverOutputAmps,
        driver_max_output_volts: '',
        location: p.location,
        enclosed_rated: 'no',
        dimming: p.dimming,
        ambient_max_c: p.ambientMaxC,
        rated_life_hours: p.ratedLifeHours,
        active_cooling: 'no',
      }).map(([k, v]) => [k, String(v)]),
    );
    const rows = [
      good,
      { ...good, model_number: `${p.modelNumber}-B`, input_volts_min: '300' },
      { ...good, family: 'chandelier', model_number: `${p.modelNumber}-C` },
    ];
    const preview = await admin.agent.post('/api/products/import?dryRun=true').send({ rows });
    expect(preview.body).toMatchObject({ total: 3, valid: 1, invalid: 2 });
    expect(preview.body.errors).toEqual([
      { row: 3, column: 'input_volts_max', message: 'The highest input voltage must be above the lowest.' },
      { row: 4, column: 'family', message: 'Pick a family.' },
    ]);
    expect(await t.ds.getRepository(ProductModel).countBy({ manufacturerId: admin.org.id })).toBe(0);
    const done = await admin.agent.post('/api/products/import').send({ rows });
    expect(done.body.imported).toBe(1);
    expect(await t.ds.getRepository(ProductModel).countBy({ manufacturerId: admin.org.id })).toBe(1);
    const twice = await admin.agent.post('/api/products/import?dryRun=true').send({ rows: [good] });
    expect(twice.body.errors[0]).toMatchObject({ row: 2, column: 'model_number' });

    const installer = await member('contractor', ['installer']);
    expect((await installer.agent.post('/api/products/import').send({ rows })).status).toBe(403);
    expect((await admin.agent.post('/api/installations/import').send({ rows: [] })).status).toBe(403);
  });

  it('serves the templates as CSV with every column', async () => {
    const admin = await member('manufacturer', ['administrator']);
    const r = await admin.agent.get('/api/products/import-template');
    expect(r.status).toBe(200);
    expect(r.headers['content-type']).toMatch(/text\/csv/);
    expect(r.text.split('\r\n')[0]).toContain('model_number,name,family,rated_input_watts');
    const installer = await member('contractor', ['installer']);
    const t2 = await installer.agent.get('/api/installations/import-template');
    expect(t2.text.split('\r\n')[0]).toContain('model_number,site_name');
  });
});

describe('the lot (date code)', () => {
  it('is optional, trimmed, bounded and validated; it is shown, edited, cleared and audited', async () => {
    const { product, installer } = await world();
    const r = await installer.agent
      .post('/api/installations')
      .send(installationPayload(product.id, { lot: ' ACH2502 ' }));
    expect(r.status).toBe(201);
    expect(r.body.installation.lot).toBe('ACH2502');
    const id = r.body.installation.id;
    expect((await t.ds.getRepository(Installation).findOneByOrFail({ id })).lot).toBe('ACH2502');
    const created = await t.ds
      .getRepository(AuditEvent)
      .findOneByOrFail({ entityType: 'Installation', entityId: id });
    expect(created.after).toMatchObject({ lot: 'ACH2502' });
    expect((await installer.agent.get(`/api/installations/${id}`)).body.installation.lot).toBe('ACH2502');
    // Without a lot: null.
    const none = await installer.agent.post('/api/installations').send(installationPayload(product.id));
    expect(none.body.installation.lot).toBeNull();

    // Too long or with other characters: a field error, and nothing changes.
    for (const [lot, message] of [
      ['A'.repeat(33), 'A lot (date code) has at most 32 characters.'],
      ['lot 7', 'Use letters, digits and . _ / - in a lot (date code).'],
    ]) {
      const bad = await installer.agent.patch(`/api/installations/${id}`).send({ lot });
      expect(bad.status).toBe(400);
      expect(bad.body.error.details).toEqual([{ path: 'lot', message }]);
    }
    const refused = await installer.agent
      .post('/api/installations')
      .send(installationPayload(product.id, { lot: 'B'.repeat(33) }));
    expect(refused.status).toBe(400);
    expect(refused.body.error.details.map((d: { path: string }) => d.path)).toEqual(['lot']);
    expect(await countInstallations(installer.org.id)).toBe(2);
    expect((await t.ds.getRepository(Installation).findOneByOrFail({ id })).lot).toBe('ACH2502');

    const edited = await installer.agent.patch(`/api/installations/${id}`).send({ lot: 'ACH2503' });
    expect(edited.body.installation.lot).toBe('ACH2503');
    const cleared = await installer.agent.patch(`/api/installations/${id}`).send({ lot: null });
    expect(cleared.status).toBe(200);
    expect(cleared.body.installation.lot).toBeNull();
    const h = await installer.agent.get(`/api/installations/${id}/history`);
    expect(
      h.body.items.slice(1).map((e: { before: unknown; after: unknown }) => [e.before, e.after]),
    ).toEqual([
      [{ lot: 'ACH2502' }, { lot: 'ACH2503' }],
      [{ lot: 'ACH2503' }, { lot: null }],
    ]);
  });

  it('is a column of the import and its template; a bad lot is a row error on that column', async () => {
    const { product, installer } = await world();
    const template = await installer.agent.get('/api/installations/import-template');
    const [example] = Papa.parse<Record<string, string>>(template.text, {
      header: true,
      skipEmptyLines: true,
    }).data;
    expect(example.lot).toBe('AC2401');
    const header =
      'model_number,site_name,site_address,site_city,site_region,site_postal_code,quantity,install_date,lot,location,enclosure,dimmer,nominal_supply_volts,hours_per_day,ambient_c';
    const row = (site: string, lot: string) =>
      `${product.modelNumber},${site},1 Road,Town,WA,98000,2,2024-04-01,${lot},dry,open,none,277,12,20`;
    const csv = [
      header,
      row('With lot', 'VLT2411'),
      row('Without lot', ''),
      row('Long lot', 'X'.repeat(33)),
    ].join('\n');
    const preview = await installer.agent.post('/api/installations/import?dryRun=true').send({ csv });
    expect(preview.body).toMatchObject({ total: 3, valid: 2, invalid: 1 });
    expect(preview.body.errors).toEqual([
      { row: 4, column: 'lot', message: 'A lot (date code) has at most 32 characters.' },
    ]);
    const done = await installer.agent.post('/api/installations/import').send({ csv });
    expect(done.body.imported).toBe(2);
    const repo = t.ds.getRepository(Installation);
    expect((await repo.findOneByOrFail({ contractorId: installer.org.id, siteName: 'With lot' })).lot).toBe(
      'VLT2411',
    );
    expect(
      (await repo.findOneByOrFail({ contractorId: installer.org.id, siteName: 'Without lot' })).lot,
    ).toBeNull();
    expect(await repo.countBy({ contractorId: installer.org.id, siteName: 'Long lot' })).toBe(0);
  });
});

describe('install dates in the future', () => {
  const DAY = 86_400_000;
  const utcDate = (ms: number) => new Date(ms).toISOString().slice(0, 10);
  const future = {
    path: 'installDate',
    message: 'The install date is in the future. Enter the day the fixtures were installed.',
  };

  it('are refused by the server clock, allowing today in any time zone; nothing is written', async () => {
    const { product, installer } = await world();
    const now = clock.nowMs();
    // The furthest-ahead local date on Earth is UTC+14 (Pacific/Kiritimati) — from memory (IANA tz database).
    const todayAtUtcPlus14 = utcDate(now + 14 * 3_600_000);
    const ok = await installer.agent
      .post('/api/installations')
      .send(installationPayload(product.id, { installDate: todayAtUtcPlus14, purchaseDate: null }));
    expect(ok.status).toBe(201);
    const tomorrowUtc = await installer.agent
      .post('/api/installations')
      .send(installationPayload(product.id, { installDate: utcDate(now + DAY), purchaseDate: null }));
    expect(tomorrowUtc.status).toBe(201);

    const later = await installer.agent
      .post('/api/installations')
      .send(installationPayload(product.id, { installDate: utcDate(now + 2 * DAY), purchaseDate: null }));
    expect(later.status).toBe(400);
    expect(later.body.error.details).toEqual([future]);
    const edit = await installer.agent
      .patch(`/api/installations/${ok.body.installation.id}`)
      .send({ installDate: utcDate(now + 30 * DAY) });
    expect(edit.status).toBe(400);
    expect(edit.body.error.details).toEqual([future]);
    expect(await countInstallations(installer.org.id)).toBe(2);
    expect(
      (await t.ds.getRepository(Installation).findOneByOrFail({ id: ok.body.installation.id })).installDate,
    ).toBe(todayAtUtcPlus14);

    // The server's clock decides: five days on, the same date is no longer in the future.
    const inFiveDays = utcDate(now + 5 * DAY);
    expect(
      (
        await installer.agent
          .post('/api/installations')
          .send(installationPayload(product.id, { installDate: inFiveDays, purchaseDate: null }))
      ).status,
    ).toBe(400);
    clock.advance(5 * DAY);
    const again = await signIn(t.request(), installer.user.email); // the session has expired by then
    expect(
      (
        await again
          .post('/api/installations')
          .send(installationPayload(product.id, { installDate: inFiveDays, purchaseDate: null }))
      ).status,
    ).toBe(201);
  });

  it('are a row error in an import', async () => {
    const { product, installer } = await world();
    const header =
      'model_number,site_name,site_address,site_city,site_region,site_postal_code,quantity,install_date,location,enclosure,dimmer,nominal_supply_volts,hours_per_day,ambient_c';
    const row = (site: string, date: string) =>
      `${product.modelNumber},${site},1 Road,Town,WA,98000,2,${date},dry,open,none,277,12,20`;
    const csv = [header, row('Done', '2024-04-01'), row('Planned', utcDate(clock.nowMs() + 10 * DAY))].join(
      '\n',
    );
    const r = await installer.agent.post('/api/installations/import').send({ csv });
    expect(r.body).toMatchObject({ total: 2, valid: 1, invalid: 1, imported: 1 });
    expect(r.body.errors).toEqual([{ row: 3, column: 'install_date', message: future.message }]);
  });
});
