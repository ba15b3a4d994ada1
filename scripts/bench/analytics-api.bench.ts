// npm run bench:analytics-api (after npm run demo:large)
// Times the reliability endpoints on the large demo (about 1,000,000 installed units and 100,000 claims) through
// the real app, beside a baseline measured in the same run on the same data: the raw GROUP BY query alone that
// feeds the endpoint. The ratio (endpoint / query) is the cost of everything but the database, and is what to
// compare between machines; the fit's own time (the shared fitWeibull on the grouped counts) is printed too.
// Prints; asserts nothing. BENCH_RUNS=3 for a quicker run.
import supertest from 'supertest';
import { fitWeibull } from '../../shared/analytics/weibull';
import { createApp } from '../../server/app';
import { loadConfig } from '../../server/config/env';
import { createDataSource } from '../../server/db/data-source';
import { DEMO_PASSWORD } from '../../server/db/seed/demo-accounts';
import { createLogger } from '../../server/lib/logger';
import { createAnalyticsService } from '../../server/modules/analytics/analytics.service';
import { startLocalDb } from '../lib/mariadb';

const RUNS = Number(process.env.BENCH_RUNS ?? 7);

async function median(fn: () => Promise<unknown> | unknown): Promise<number> {
  await fn(); // warm-up
  const times: number[] = [];
  for (let i = 0; i < RUNS; i++) {
    const t0 = performance.now();
    await fn();
    times.push(performance.now() - t0);
  }
  times.sort((a, b) => a - b);
  return times[Math.floor(times.length / 2)];
}

async function main() {
  const config = loadConfig({ ...process.env, LOG_LEVEL: 'silent', APP_MODE: 'demo' });
  let url = config.databaseUrl;
  let stop = async () => {};
  if (!url) {
    const db = await startLocalDb({ dataDir: config.dataDir, profile: 'demo', port: config.dbPort });
    url = db.url;
    stop = db.stop;
  }
  const ds = createDataSource(url, { poolSize: 4 });
  await ds.initialize();
  const app = createApp({ config, ds, logger: createLogger('silent'), databaseUrl: url });
  try {
    const agent = supertest.agent(app);
    const login = await agent
      .post('/api/auth/login')
      .send({ email: 'rhea@aldercrest.test', password: DEMO_PASSWORD });
    if (login.status !== 200)
      throw new Error(
        'Sign-in failed: load the demo (npm start) and the large demo (npm run demo:large) first.',
      );
    const accountant = supertest.agent(app);
    await accountant.post('/api/auth/login').send({ email: 'ada@aldercrest.test', password: DEMO_PASSWORD });
    const mfr = login.body.user.organization.id as string;
    const [model] = await ds.query(`SELECT id FROM product_models WHERE model_number = 'AC-HB150-D'`);
    const [{ units, claims }] = await ds.query(
      `SELECT (SELECT SUM(quantity) FROM installations WHERE manufacturer_id = ?) AS units, (SELECT COUNT(*) FROM claims WHERE manufacturer_id = ?) AS claims`,
      [mfr, mfr],
    );
    const service = createAnalyticsService(ds);
    const asOf = new Date().toISOString().slice(0, 10);
    console.log(
      `Aldercrest on this database: ${Number(units).toLocaleString('en-US')} installed units, ${Number(claims).toLocaleString('en-US')} claims; ${RUNS} runs each, medians.\n`,
    );

    const cases = [
      {
        name: 'life, one model, months',
        path: `/api/analytics/life?productModelId=${model.id}&ageUnit=months`,
        pop: { kind: 'model' as const, productModelId: model.id, label: '' },
        unit: 'months' as const,
      },
      {
        name: 'life, high-bay family, hours',
        path: '/api/analytics/life?family=high_bay&ageUnit=hours',
        pop: { kind: 'family' as const, family: 'high_bay' as const, label: '' },
        unit: 'hours' as const,
      },
    ];
    const rows: string[][] = [];
    for (const c of cases) {
      const query = await median(() => service.lifeData(mfr, c.pop, { asOf, unit: c.unit, midpoint: true }));
      const life = await service.lifeData(mfr, c.pop, { asOf, unit: c.unit, midpoint: true });
      const fit = await median(() => fitWeibull({ failures: life.failures, suspensions: life.suspensions }));
      const endpoint = await median(async () => {
        const r = await agent.get(c.path);
        if (r.status !== 200) throw new Error(`${c.path}: ${r.status}`);
      });
      rows.push([
        c.name,
        `${life.units.toLocaleString('en-US')} units, ${(life.failures.length + life.suspensions.length).toLocaleString('en-US')} groups`,
        endpoint.toFixed(1),
        query.toFixed(1),
        fit.toFixed(2),
        (endpoint / query).toFixed(2),
      ]);
    }
    const reserveQuery = await median(() =>
      Promise.all([
        service.lifeDataByModel(mfr, { asOf, midpoint: true }),
        service.reserveCohorts(mfr, asOf),
      ]),
    );
    const reserve = await median(async () => {
      const r = await accountant.get('/api/reserve');
      if (r.status !== 200) throw new Error(`reserve: ${r.status}`);
    });
    rows.push([
      'reserve, 12 months',
      'all models',
      reserve.toFixed(1),
      reserveQuery.toFixed(1),
      '-',
      (reserve / reserveQuery).toFixed(2),
    ]);

    const head = [
      'case',
      'data',
      'endpoint ms',
      'GROUP BY query ms (baseline)',
      'fit ms',
      'ratio endpoint/query',
    ];
    const widths = head.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
    const line = (r: string[]) => r.map((c, i) => c.padEnd(widths[i])).join('  ');
    console.log(line(head));
    for (const r of rows) console.log(line(r));
  } finally {
    await app.close();
    await ds.destroy();
    await stop();
  }
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
