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
    const mfr = await createOrganization(t.ds, 'manufacturer');
    const product = await createProduct(t.ds, mfr);
    const contractor = await createOrganization(t.ds, 'contractor');
    const user = await createUser(t.ds, contractor, ['installer']);
    const agent = await signIn(t.request(), user.email);
    const n = 2_500;
    const csv = [
      HEADER,
      ...Array.from(
        { length: n },
        (_, i) =>
          `${product.modelNumber},Bay ${i},${i} Road,Town,WA,98000,1,PRG-${i},2024-04-01,dry,open,none,277,12,20`,
      ),
    ].join('\n');
    const res = await agent
      .post('/api/installations/import')
      .set('Accept', 'application/x-ndjson')
      .buffer(true)
      .parse((r, cb) => {
        let text = '';
        r.setEncoding('utf8');
        r.on('data', (c: string) => (text += c));
        r.on('end', () => cb(null, text));
      })
      .send({ csv });
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/application\/x-ndjson/);
    const lines = linesOf(res.body as string);
    const progress = lines.filter((l) => l.progress).map((l) => l.progress!);
    expect(progress.filter((p) => p.phase === 'checking').map((p) => p.done)).toEqual([0, 1000, 2000]);
    const writing = progress.filter((p) => p.phase === 'writing');
    expect(writing[0]).toEqual({ phase: 'writing', done: 0, total: n });
    expect(writing.map((p) => p.done)).toEqual([...writing.map((p) => p.done)].sort((a, b) => a - b));
    expect(lines.at(-1)).toMatchObject({ result: { imported: n } });
    expect(await t.ds.getRepository(Installation).countBy({ contractorId: contractor.id })).toBe(n);
    expect(
      await t.ds
        .getRepository(AuditEvent)
        .countBy({ organizationId: contractor.id, action: 'installation.imported' }),
    ).toBe(n);
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
