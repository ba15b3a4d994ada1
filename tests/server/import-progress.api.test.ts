import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent } from '../../server/db/entities/audit-event.entity';
import { Installation } from '../../server/db/entities/installation.entity';
import { createOrganization, createUser, signIn } from '../support/factories';
import { createProduct } from '../support/catalogue-factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

// The installations import with its progress (server/lib/import-stream.ts): asked with
// `Accept: application/x-ndjson`, the answer is progress lines as the rows are checked and written, then the
// result; the rows are written and audited as by the plain JSON import, all in one transaction.

let t: TestContext;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => closeTestApp(t));

/** A manufacturer's product, and a contractor's installer signed in. */
async function installerWithProduct() {
  const product = await createProduct(t.ds, await createOrganization(t.ds, 'manufacturer'));
  const contractor = await createOrganization(t.ds, 'contractor');
  const user = await createUser(t.ds, contractor, ['installer']);
  return { product, contractor, agent: await signIn(t.request(), user.email) };
}

const HEADER =
  'model_number,site_name,site_address,site_city,site_region,site_postal_code,quantity,serials,install_date,location,enclosure,dimmer,nominal_supply_volts,hours_per_day,ambient_c';

type Line = {
  progress?: { phase: string; done: number; total: number };
  result?: { imported: number };
  error?: { code: string };
};
const linesOf = (text: string) =>
  text
    .split('\n')
    .filter(Boolean)
    .map((l) => JSON.parse(l) as Line);

describe('installations import with progress', () => {
  it('answers progress lines, then the result; writes and audits every row', async () => {
    const { product, contractor, agent } = await installerWithProduct();
    const n = 2_500;
    const csv = [
      HEADER,
      ...Array.from(
        { length: n },
        (_, i) =>
          `${product.modelNumber},Bay ${i},${i} Road,Town,WA,98000,1,PRG-${i},2024-04-01,dry,open,none,277,12,20`,
      ),
    ].join('\n');
    const ndjson = (path: string) =>
      agent
        .post(path)
        .set('Accept', 'application/x-ndjson')
        .buffer(true)
        .parse((r, cb) => {
          let text = '';
          r.setEncoding('utf8');
          r.on('data', (c: string) => (text += c));
          r.on('end', () => cb(null, text));
        })
        .send({ csv });
    // A preview only checks: its progress counts the rows checked.
    const preview = linesOf((await ndjson('/api/installations/import?dryRun=true')).body as string);
    expect(preview.filter((l) => l.progress).map((l) => l.progress)).toEqual(
      [0, 1000, 2000].map((done) => ({ phase: 'checking', done, total: n })),
    );
    expect(preview.at(-1)).toMatchObject({ result: { dryRun: true, valid: n, imported: 0 } });
    const res = await ndjson('/api/installations/import');
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/application\/x-ndjson/);
    const lines = linesOf(res.body as string);
    const progress = lines.filter((l) => l.progress).map((l) => l.progress!);
    // Importing, the rows are checked and written a thousand at a time (the next chunk checked while the last is
    // written), so the progress is one count of rows done, from none to all.
    expect(progress).toEqual([0, 1000, 2000, 2500].map((done) => ({ phase: 'writing', done, total: n })));
    expect(lines.at(-1)).toMatchObject({ result: { imported: n } });
    expect(await t.ds.getRepository(Installation).countBy({ contractorId: contractor.id })).toBe(n);
    expect(
      await t.ds
        .getRepository(AuditEvent)
        .countBy({ organizationId: contractor.id, action: 'installation.imported' }),
    ).toBe(n);
  });

  it('judges each row as a whole-file check would, across the chunks it is written in', async () => {
    const { product, contractor, agent } = await installerWithProduct();
    const line = (i: number, serial = `CHK-${i}`, date = '2024-04-01') =>
      `${product.modelNumber},Bay ${i},${i} Road,Town,WA,98000,1,${serial},${date},dry,open,none,277,12,20`;
    // Registered before the file: a serial the third chunk repeats.
    const first = await agent
      .post('/api/installations/import')
      .send({ csv: [HEADER, line(0, 'CHK-TAKEN')].join('\n') });
    expect(first.body).toMatchObject({ imported: 1 });
    const n = 2_500;
    const rows = Array.from({ length: n }, (_, i) => line(i + 1));
    rows[1_499] = line(1_500, 'CHK-10'); // the serial of the tenth row, a chunk earlier
    rows[2_099] = line(2_100, 'CHK-TAKEN'); // already registered
    rows[2_199] = line(2_200, 'CHK-2200', '2024-13-45'); // no such date
    const res = await agent.post('/api/installations/import').send({ csv: [HEADER, ...rows].join('\n') });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ total: n, valid: n - 3, invalid: 3, imported: n - 3 });
    const errors = res.body.errors as { row: number; column: string; message: string }[];
    // Row numbers count the header as row 1.
    expect(errors.map((e) => [e.row, e.column])).toEqual([
      [1_501, 'serials'],
      [2_101, 'serials'],
      [2_201, 'install_date'],
    ]);
    expect(errors[0].message).toMatch(/earlier row: CHK-10 \(row 11\)/);
    expect(errors[1].message).toMatch(/Already registered for this model: CHK-TAKEN/);
    expect(await t.ds.getRepository(Installation).countBy({ contractorId: contractor.id })).toBe(n - 3 + 1);
  });

  it('refuses before any work as plain JSON, and answers plain JSON to a client that does not ask', async () => {
    const contractor = await createOrganization(t.ds, 'contractor');
    const user = await createUser(t.ds, contractor, ['installer']);
    const agent = await signIn(t.request(), user.email);
    const bad = await agent
      .post('/api/installations/import')
      .set('Accept', 'application/x-ndjson')
      .send({ nothing: true });
    expect(bad.status).toBe(400);
    expect(bad.body.error.code).toBe('validation.failed');
    const plain = await agent.post('/api/installations/import').send({ csv: `${HEADER}\n` });
    expect(plain.status).toBe(200);
    expect(plain.body).toMatchObject({ imported: 0 });
  });
});
