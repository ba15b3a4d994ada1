import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemo } from '../../server/db/seed/demo';
import { createStorage } from '../../server/lib/storage';
import { DEMO_PASSWORD } from '../../server/db/seed/demo-accounts';
import { ProductModel } from '../../server/db/entities/product-model.entity';
import { signIn } from '../support/factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

// The demo's reliability story (server/db/seed/reliability-story.ts) has to show in the analytics: a weak lot,
// a model failing in enclosed fixtures, and a reserve for each manufacturer.

let t: TestContext;
beforeAll(async () => {
  t = await createTestApp();
  await seedDemo(t.ds, {
    onlyIfEmpty: false,
    credits: { storage: createStorage(t.config), config: t.config },
  });
}, 120_000);
afterAll(() => closeTestApp(t));

const model = (modelNumber: string) => t.ds.getRepository(ProductModel).findOneByOrFail({ modelNumber });
const as = (email: string) => signIn(t.request(), email, DEMO_PASSWORD);

describe('the demo reliability story', () => {
  it('Aldercrest AC-HB150-D: lot ACH2502 leads the claims by lot and fails far sooner than the model', async () => {
    const rhea = await as('rhea@aldercrest.test');
    const hb = await model('AC-HB150-D');
    const modes = await rhea.get(`/api/analytics/failure-modes?productModelId=${hb.id}`);
    expect(modes.status).toBe(200);
    expect(modes.body.lots[0].key).toBe('ACH2502');
    const lot = await rhea.get('/api/analytics/life?lot=ACH2502');
    const all = await rhea.get(`/api/analytics/life?productModelId=${hb.id}`);
    expect(lot.body.fit.b10).toBeLessThan(all.body.fit.b10 / 2);
    expect(lot.body.fit.shape).toBeLessThan(1.6); // early failures: near-constant hazard, not wear-out
  });

  it('Veltra VL-WP80-W fails mostly in enclosed fixtures, as driver failures', async () => {
    const theo = await as('theo@veltra.test');
    const wp = await model('VL-WP80-W');
    const r = await theo.get(`/api/analytics/failure-modes?productModelId=${wp.id}&factor=enclosure`);
    expect(r.body.environment.enclosure[0].key).toBe('enclosed');
    expect(r.body.environment.enclosure[0].share).toBeGreaterThan(0.6);
    expect(r.body.modes[0].key).toBe('driver');
  });

  it('Aldercrest AC-CL54-E39 fan-cooled corn lamps outdoors: insects first', async () => {
    const rhea = await as('rhea@aldercrest.test');
    const cl = await model('AC-CL54-E39');
    const r = await rhea.get(`/api/analytics/failure-modes?productModelId=${cl.id}`);
    expect(r.body.modes[0].key).toBe('insects_debris');
  });

  it('every demo model can be fitted, and both accountants get a reserve in dollars for the next 12 months', async () => {
    for (const [reviewer, accountant] of [
      ['rhea@aldercrest.test', 'ada@aldercrest.test'],
      ['theo@veltra.test', 'vera@veltra.test'],
    ]) {
      const agent = await as(accountant);
      const r = await agent.get('/api/reserve');
      expect(r.status).toBe(200);
      expect(r.body.totals.map((x: { currency: string }) => x.currency)).toContain('USD');
      expect(Number(r.body.totals[0].amount)).toBeGreaterThan(0);
      expect(r.body.monthLabels).toHaveLength(12);
      const rev = await as(reviewer);
      const ageing = await rev.get('/api/analytics/claims-ageing');
      expect(ageing.body.throughput.some((w: { decided: number }) => w.decided > 0)).toBe(true);
      expect(ageing.body.open.some((b: { total: number }) => b.total > 0)).toBe(true);
    }
  });
});
