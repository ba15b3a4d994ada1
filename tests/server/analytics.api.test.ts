import Papa from 'papaparse';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { isCoveredClaim } from '../../shared/analytics/covered';
import { failureModeOf } from '../../shared/analytics/failure-mode-rules';
import { ageingTable, rankByEnvironment, rankFailureModes } from '../../shared/analytics/failure-modes';
import { installedLifeData, type InstalledUnits } from '../../shared/analytics/life-data';
import { wholeMonthsBetween } from '../../shared/engine/dates';
import { CLAIM_STAGES } from '../../shared/schemas/claims';
import { createAnalyticsService } from '../../server/modules/analytics/analytics.service';
import {
  coveredClaimSql,
  failureModeSql,
  wholeMonthsSql,
} from '../../server/modules/analytics/analytics.sql';
import { insertClaims, insertInstallations } from '../support/analytics-factories';
import { createPolicy, createProduct } from '../support/catalogue-factories';
import { createOrganization, createUser, signIn } from '../support/factories';
import { closeTestApp, createTestApp, type TestContext } from '../support/test-app';

let t: TestContext;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => closeTestApp(t));

type Org = Awaited<ReturnType<typeof createOrganization>>;
async function member(org: Org, roles: Parameters<typeof createUser>[2]) {
  const user = await createUser(t.ds, org, roles);
  return signIn(t.request(), user.email);
}

function addDays(iso: string, days: number) {
  return new Date(Date.parse(`${iso}T00:00:00Z`) + days * 86_400_000).toISOString().slice(0, 10);
}

const csvRows = (text: string) => Papa.parse<string[]>(text.trim(), { skipEmptyLines: true }).data;

// Meeker & Escobar (1998), Statistical Methods for Reliability Data, Table C.5: the bearing-cage field data,
// 6 failures among 1,703 units (hours), the rest suspended at their current hours.
const BEARING_CAGE_FAILURES = [230, 334, 423, 990, 1009, 1510];
const BEARING_CAGE_SUSPENSIONS: [number, number][] = [
  [288, 50],
  [148, 150],
  [124, 250],
  [111, 350],
  [106, 450],
  [99, 550],
  [110, 650],
  [114, 750],
  [119, 850],
  [127, 950],
  [123, 1050],
  [93, 1150],
  [47, 1250],
  [41, 1350],
  [27, 1450],
  [11, 1550],
  [6, 1650],
  [1, 1850],
  [2, 2050],
];

describe('the SQL matches the shared definitions', () => {
  it("whole months in SQL are the engine's wholeMonthsBetween, month ends included", async () => {
    const pairs = [
      ['2024-01-31', '2024-02-29'],
      ['2025-01-31', '2025-02-28'],
      ['2025-01-31', '2025-02-27'],
      ['2024-03-15', '2024-03-14'],
      ['2023-12-31', '2024-06-30'],
      ['2024-02-29', '2025-02-28'],
      ['2024-05-10', '2024-05-10'],
      ['2022-07-01', '2025-06-30'],
    ];
    for (const [from, to] of pairs) {
      const [row] = await t.ds.query(
        `SELECT ${wholeMonthsSql('x.a', 'x.b')} AS m FROM (SELECT CAST(? AS DATE) AS a, CAST(? AS DATE) AS b) x`,
        [from, to],
      );
      expect(Number(row.m), `${from} -> ${to}`).toBe(wholeMonthsBetween(from, to));
    }
  });

  it('a covered claim in SQL is isCoveredClaim, for every stage and verdict', async () => {
    for (const stage of CLAIM_STAGES) {
      for (const verdict of ['covered', 'excluded', 'review', null] as const) {
        const [row] = await t.ds.query(
          `SELECT ${coveredClaimSql('c')} AS covered FROM (SELECT ? AS stage, ? AS verdict) c`,
          [stage, verdict],
        );
        expect(Number(row.covered) === 1, `${stage} / ${verdict}`).toBe(isCoveredClaim({ stage, verdict }));
      }
    }
  });

  it('the failure mode in SQL is failureModeOf, evidence first', async () => {
    const cases: { symptoms: string[]; findings: string[]; observations?: Record<string, boolean> }[] = [
      { symptoms: ['dark'], findings: [], observations: { debrisIngress: true } },
      { symptoms: ['dim'], findings: [], observations: { fanStopped: true, debrisIngress: false } },
      { symptoms: ['dark'], findings: [], observations: { waterIngress: false } },
      { symptoms: ['dark'], findings: ['evidence.debris_ingress', 'electrical.string_open'] },
      { symptoms: ['fan_noise'], findings: [] },
      { symptoms: ['dark', 'flicker'], findings: [] },
      { symptoms: ['partly_dark'], findings: ['electrical.string_open'] },
      { symptoms: ['dim'], findings: [] },
      { symptoms: ['other'], findings: ['evidence.water_ingress'] },
      { symptoms: ['other'], findings: [] },
      { symptoms: [], findings: ['electrical.driver_at_voltage_limit'] },
    ];
    for (const c of cases) {
      const evaluation = JSON.stringify({ findings: c.findings.map((code) => ({ code })) });
      const [row] = await t.ds.query(
        `SELECT ${failureModeSql('c')} AS mode FROM (SELECT ? AS symptoms, ? AS evaluation, ? AS observations) c`,
        [JSON.stringify(c.symptoms), evaluation, JSON.stringify(c.observations ?? {})],
      );
      expect(row.mode, JSON.stringify(c)).toBe(failureModeOf(c.symptoms, c.findings, c.observations));
    }
  });

  it('grouped life data from the database equal installedLifeData on the same installations, in months and hours', async () => {
    const mfr = await createOrganization(t.ds, 'manufacturer');
    const contractor = await createOrganization(t.ds, 'contractor');
    const product = await createProduct(t.ds, mfr);
    const asOf = '2025-06-30';
    const fixtures = [
      { installDate: '2023-01-31', quantity: 10, hoursPerDay: 12 },
      { installDate: '2023-02-15', quantity: 3, hoursPerDay: 24 },
      { installDate: '2024-06-01', quantity: 40, hoursPerDay: 10 },
      { installDate: '2025-06-29', quantity: 5, hoursPerDay: 8 },
      { installDate: '2025-07-15', quantity: 7, hoursPerDay: 8 }, // after asOf: left out
    ];
    const inst = await insertInstallations(t.ds, contractor, product, fixtures);
    const claims = [
      { installationId: inst[0].id, failedOn: '2023-02-28', units: 2 }, // Jan 31 -> Feb 28: 0 whole months
      { installationId: inst[0].id, failedOn: '2024-03-31', units: 1 },
      { installationId: inst[1].id, failedOn: '2023-03-01', units: 2 },
      { installationId: inst[1].id, failedOn: '2023-05-01', units: 4 }, // more than is left: cut to 1
      { installationId: inst[2].id, failedOn: '2024-06-01', units: 1 }, // failed on the day: age 0
      { installationId: inst[2].id, failedOn: '2025-01-10', units: 3 },
      { installationId: inst[2].id, failedOn: '2025-08-01', units: 1 }, // after asOf: still working then
      { installationId: inst[2].id, failedOn: '2024-09-09', units: 2, stage: 'denied' as const },
      {
        installationId: inst[2].id,
        failedOn: '2024-10-09',
        units: 2,
        stage: 'in_review' as const,
        verdict: 'excluded' as const,
      },
      {
        installationId: inst[2].id,
        failedOn: '2024-11-09',
        units: 1,
        stage: 'in_review' as const,
        verdict: 'covered' as const,
      },
    ];
    await insertClaims(t.ds, inst, claims);
    const shared: InstalledUnits[] = fixtures.map((f, i) => ({
      installedOn: f.installDate,
      quantity: f.quantity,
      hoursPerDay: f.hoursPerDay,
      failures: claims
        .filter(
          (c) =>
            c.installationId === inst[i].id &&
            isCoveredClaim({ stage: c.stage ?? 'approved', verdict: c.verdict ?? 'covered' }),
        )
        .sort((a, b) => a.failedOn.localeCompare(b.failedOn))
        .map((c) => ({ failedOn: c.failedOn, units: c.units })),
    }));
    const service = createAnalyticsService(t.ds);
    for (const unit of ['months', 'hours'] as const) {
      for (const age of ['completed', 'midpoint'] as const) {
        const expected = installedLifeData(shared, { asOf, unit, age });
        const got = await service.lifeData(
          mfr.id,
          { kind: 'model', productModelId: product.id, label: '' },
          { asOf, unit, midpoint: age === 'midpoint' },
        );
        expect(got.failures, `${unit} ${age}`).toEqual(expected.failures);
        expect(got.suspensions, `${unit} ${age}`).toEqual(expected.suspensions);
        expect(got.units).toBe(expected.units);
        expect(got.failed).toBe(expected.failed);
        expect(got.excessFailures).toBe(expected.excessFailures);
      }
    }
  });
});

async function bearingCageWorld() {
  const mfr = await createOrganization(t.ds, 'manufacturer');
  const contractor = await createOrganization(t.ds, 'contractor');
  const product = await createProduct(t.ds, mfr);
  const asOf = '2030-06-30';
  // One hour a day, so that days in service are the hours of the published data.
  const survivors = BEARING_CAGE_SUSPENSIONS.map(([count, hours]) => ({
    installDate: addDays(asOf, -hours),
    quantity: count,
    hoursPerDay: 1,
    lot: 'BC01',
  }));
  const failing = BEARING_CAGE_FAILURES.map(() => ({
    installDate: addDays(asOf, -3000),
    quantity: 1,
    hoursPerDay: 1,
    lot: 'BC02',
    enclosure: 'enclosed' as const,
  }));
  const inst = await insertInstallations(t.ds, contractor, product, [...survivors, ...failing]);
  const failed = inst.slice(survivors.length);
  await insertClaims(
    t.ds,
    failed,
    BEARING_CAGE_FAILURES.map((hours, i) => ({
      installationId: failed[i].id,
      failedOn: addDays(failed[i].installDate, hours),
      symptoms: i < 4 ? ['dark'] : ['fan_noise'],
    })),
  );
  return { mfr, contractor, product, asOf };
}

describe('GET /api/analytics/life', () => {
  it('the bearing-cage data through the database: shape 2.035, scale 11792 h, B10 3903 h (Meeker & Escobar 1998, Table C.5)', async () => {
    const { mfr, product, asOf } = await bearingCageWorld();
    const reviewer = await member(mfr, ['reviewer']);
    const r = await reviewer.get(
      `/api/analytics/life?productModelId=${product.id}&ageUnit=hours&age=completed&asOf=${asOf}`,
    );
    expect(r.status).toBe(200);
    expect(r.body.lifeData).toMatchObject({ units: 1703, failed: 6, survivors: 1697, unit: 'hours' });
    expect(r.body.fit.shape).toBeCloseTo(2.035, 3); // Meeker & Escobar (1998), Table C.5, bearing-cage data
    expect(Math.round(r.body.fit.scale)).toBe(11792); // Meeker & Escobar (1998), Table C.5, bearing-cage data
    expect(Math.round(r.body.fit.b10)).toBe(3903); // Meeker & Escobar (1998), Table C.5, bearing-cage data
    expect(r.body.probabilityPlot.points).toHaveLength(6);
    // Kaplan-Meier at each failure, computed here from the published table (not by kaplanMeier()):
    //   n_i = 1703 - units suspended before t_i - units failed before t_i,  S = prod (1 - 1/n_i),
    //   Greenwood: SE = S sqrt(sum 1 / (n_i (n_i - 1))), band S +/- 1.959964 SE.
    let S = 1;
    let greenwood = 0;
    BEARING_CAGE_FAILURES.forEach((time, i) => {
      const suspendedBefore = BEARING_CAGE_SUSPENSIONS.filter(([, h]) => h < time).reduce(
        (n, [c]) => n + c,
        0,
      );
      const atRisk = 1703 - suspendedBefore - i;
      S *= 1 - 1 / atRisk;
      greenwood += 1 / (atRisk * (atRisk - 1));
      const row = r.body.kaplanMeier.find((k: { time: number }) => k.time === time);
      expect(row.atRisk, `at risk before ${time} h`).toBe(atRisk);
      expect(row.survival).toBeCloseTo(S, 12);
      expect(row.upper).toBeCloseTo(Math.min(1, S + 1.959964 * S * Math.sqrt(greenwood)), 12);
      expect(row.lower).toBeCloseTo(S - 1.959964 * S * Math.sqrt(greenwood), 12);
    });
    // Before 230 h: 288 (at 50 h) + 148 (at 150 h) = 436 suspended, so 1267 at risk; S(230) = 1266/1267.
    expect(r.body.kaplanMeier.find((k: { time: number }) => k.time === 230).survival).toBeCloseTo(
      1266 / 1267,
      14,
    );
    // Regression is the alternative.
    const mrr = await reviewer.get(
      `/api/analytics/life?productModelId=${product.id}&ageUnit=hours&age=completed&asOf=${asOf}&method=mrr`,
    );
    expect(mrr.body.fit.method).toBe('mrr');
    expect(mrr.body.fit.shape).not.toBeCloseTo(r.body.fit.shape, 3);
  });

  it('by lot and family too; a lot never installed is 404; the CSV tables are the JSON numbers', async () => {
    const { mfr, asOf } = await bearingCageWorld();
    const reviewer = await member(mfr, ['reviewer']);
    const lot = await reviewer.get(`/api/analytics/life?lot=BC02&ageUnit=hours&age=completed&asOf=${asOf}`);
    expect(lot.status).toBe(200);
    expect(lot.body.lifeData).toMatchObject({ units: 6, failed: 6 });
    expect(lot.body.population).toMatchObject({ kind: 'lot', lot: 'BC02' });
    expect((await reviewer.get(`/api/analytics/life?lot=NOPE1&asOf=${asOf}`)).status).toBe(404);
    const family = await reviewer.get(
      `/api/analytics/life?family=troffer&ageUnit=hours&age=completed&asOf=${asOf}`,
    );
    expect(family.body.lifeData.units).toBe(1703);

    const json = await reviewer.get(
      `/api/analytics/life?family=troffer&ageUnit=hours&age=completed&asOf=${asOf}`,
    );
    const km = await reviewer.get(
      `/api/analytics/life?family=troffer&ageUnit=hours&age=completed&asOf=${asOf}&format=csv&table=kaplan-meier`,
    );
    expect(km.status).toBe(200);
    expect(km.headers['content-type']).toMatch(/^text\/csv/);
    expect(km.headers['content-disposition']).toMatch(
      /^attachment; filename="?lumenproof-kaplan-meier-[a-z0-9-]+\.csv"?$/,
    );
    const rows = csvRows(km.text);
    expect(rows[0]).toEqual([
      'time',
      'atRisk',
      'failed',
      'censored',
      'survival',
      'standardError',
      'lower',
      'upper',
    ]);
    expect(rows.slice(1).map((r) => r.map(Number))).toEqual(
      json.body.kaplanMeier.map((k: Record<string, number>) => [
        k.time,
        k.atRisk,
        k.failed,
        k.censored,
        k.survival,
        k.standardError,
        k.lower,
        k.upper,
      ]),
    );
    const fit = csvRows(
      (
        await reviewer.get(
          `/api/analytics/life?family=troffer&ageUnit=hours&age=completed&asOf=${asOf}&format=csv&table=fit`,
        )
      ).text,
    );
    expect(Number(fit[1][1])).toBe(json.body.fit.shape);
    expect(Number(fit[1][2])).toBe(json.body.fit.scale);
  });

  it('too few failures answer the data and a plain reason, not an error', async () => {
    const mfr = await createOrganization(t.ds, 'manufacturer');
    const contractor = await createOrganization(t.ds, 'contractor');
    const product = await createProduct(t.ds, mfr);
    const inst = await insertInstallations(t.ds, contractor, product, [
      { installDate: '2024-01-10', quantity: 20 },
    ]);
    await insertClaims(t.ds, inst, [{ installationId: inst[0].id, failedOn: '2024-05-01' }]);
    const reviewer = await member(mfr, ['reviewer']);
    const r = await reviewer.get(`/api/analytics/life?productModelId=${product.id}&asOf=2025-01-01`);
    expect(r.status).toBe(200);
    expect(r.body.fit).toBeNull();
    expect(r.body.fitError.code).toBe('fit.too_few_failures');
    expect(r.body.lifeData).toMatchObject({ units: 20, failed: 1 });
  });

  it("scoping: another manufacturer's model is 404; installers and accountants are refused (403); bad input is 400", async () => {
    const { product, asOf } = await bearingCageWorld();
    const other = await createOrganization(t.ds, 'manufacturer');
    const otherReviewer = await member(other, ['reviewer']);
    const r = await otherReviewer.get(`/api/analytics/life?productModelId=${product.id}&asOf=${asOf}`);
    expect(r.status).toBe(404);
    expect(
      (await otherReviewer.get(`/api/analytics/failure-modes?productModelId=${product.id}&asOf=${asOf}`))
        .status,
    ).toBe(404);
    expect((await otherReviewer.get(`/api/analytics/life?lot=BC01&asOf=${asOf}`)).status).toBe(404);
    // The other manufacturer's family view counts only its own (no) units.
    const fam = await otherReviewer.get(`/api/analytics/life?family=troffer&asOf=${asOf}`);
    expect(fam.body.lifeData.units).toBe(0);

    const contractor = await createOrganization(t.ds, 'contractor');
    const installer = await member(contractor, ['installer']);
    expect((await installer.get(`/api/analytics/life?productModelId=${product.id}`)).status).toBe(403);
    expect((await installer.get('/api/reserve')).status).toBe(403);
    const accountant = await member(other, ['accountant']);
    expect((await accountant.get(`/api/analytics/life?family=troffer`)).status).toBe(403);
    expect((await accountant.get(`/api/analytics/claims-ageing`)).status).toBe(403);
    expect((await otherReviewer.get('/api/reserve')).status).toBe(403);
    expect((await t.request().get('/api/analytics/life?family=troffer')).status).toBe(401);

    const both = await otherReviewer.get(`/api/analytics/life?productModelId=${product.id}&family=troffer`);
    expect(both.status).toBe(400);
    expect(both.body.error.details[0].message).toMatch(/exactly one/);
    expect((await otherReviewer.get('/api/analytics/life?family=troffer&ageUnit=years')).status).toBe(400);
    expect((await otherReviewer.get('/api/analytics/life?family=troffer&extra=1')).status).toBe(400);
    expect((await otherReviewer.get('/api/analytics/life?lot=%3Dcmd')).status).toBe(400);
    expect((await otherReviewer.get('/api/reserve?months=0')).status).toBe(403); // refused before validation: not theirs
    const acc = await member(other, ['accountant']);
    expect((await acc.get('/api/reserve?months=0')).status).toBe(400);
    expect((await acc.get('/api/reserve?months=61')).status).toBe(400);
  });
});

describe('GET /api/analytics/failure-modes', () => {
  it('ranks modes, environment, lot and contractor, and counts the ageing table, as the shared functions do', async () => {
    const { mfr, product, asOf } = await bearingCageWorld();
    const reviewer = await member(mfr, ['reviewer']);
    const r = await reviewer.get(`/api/analytics/failure-modes?productModelId=${product.id}&asOf=${asOf}`);
    expect(r.status).toBe(200);
    expect(r.body.claims).toBe(6);
    const rows = BEARING_CAGE_FAILURES.map((hours, i) => {
      const installedOn = addDays(asOf, -3000);
      return {
        failureMode: i < 4 ? 'driver' : 'fan',
        installedOn,
        failedOn: addDays(installedOn, hours),
        enclosure: 'enclosed',
        lot: 'BC02',
      };
    });
    expect(r.body.modes.map(({ label: _l, ...m }: { label: string }) => m)).toEqual(rankFailureModes(rows));
    expect(r.body.modes[0]).toMatchObject({
      key: 'driver',
      claims: 4,
      label: 'Driver (dark, cycling, flicker)',
    });
    expect(r.body.environment.enclosure).toEqual(rankByEnvironment(rows, 'enclosure'));
    expect(r.body.lots).toEqual([{ key: 'BC02', claims: 6, units: 6, share: 1 }]);
    expect(r.body.ageing).toEqual(ageingTable(rows));
    expect(r.body.crossTable).toMatchObject({
      factor: 'enclosure',
      rows: ['driver', 'fan'],
      columns: ['enclosed'],
      counts: [[4], [2]],
    });

    const csv = csvRows(
      (
        await reviewer.get(
          `/api/analytics/failure-modes?productModelId=${product.id}&asOf=${asOf}&format=csv&table=ageing`,
        )
      ).text,
    );
    expect(csv[0][0]).toBe('installMonth');
    expect(csv.slice(1).map((row) => Number(row[row.length - 1]))).toEqual(r.body.ageing.rowTotals);
  });
});

describe('GET /api/analytics/claims-ageing', () => {
  it('open claims by days since filing and who they wait on; decisions per week', async () => {
    const mfr = await createOrganization(t.ds, 'manufacturer');
    const contractor = await createOrganization(t.ds, 'contractor');
    const product = await createProduct(t.ds, mfr);
    const inst = await insertInstallations(t.ds, contractor, product, [
      { installDate: '2024-01-10', quantity: 20 },
    ]);
    const at = (iso: string) => new Date(`${iso}T12:00:00Z`);
    await insertClaims(t.ds, inst, [
      {
        installationId: inst[0].id,
        failedOn: '2025-05-01',
        stage: 'filed',
        filedAt: at('2025-06-28'),
        waitingOn: 'manufacturer',
      },
      {
        installationId: inst[0].id,
        failedOn: '2025-05-01',
        stage: 'needs_info',
        filedAt: at('2025-06-01'),
        waitingOn: 'contractor',
      },
      {
        installationId: inst[0].id,
        failedOn: '2025-05-01',
        stage: 'in_review',
        filedAt: at('2025-01-01'),
        waitingOn: 'manufacturer',
      },
      { installationId: inst[0].id, failedOn: '2025-05-01', stage: 'denied', filedAt: at('2025-06-01') }, // not open
    ]);
    const reviewer = await member(mfr, ['reviewer']);
    const r = await reviewer.get('/api/analytics/claims-ageing?asOf=2025-06-30&weeks=4');
    expect(r.status).toBe(200);
    expect(r.body.open).toEqual([
      { band: '0-7 days', manufacturer: 1, contractor: 0, total: 1 },
      { band: '8-14 days', manufacturer: 0, contractor: 0, total: 0 },
      { band: '15-30 days', manufacturer: 0, contractor: 1, total: 1 },
      { band: '31-60 days', manufacturer: 0, contractor: 0, total: 0 },
      { band: '61-90 days', manufacturer: 0, contractor: 0, total: 0 },
      { band: 'over 90 days', manufacturer: 1, contractor: 0, total: 1 },
    ]);
    expect(r.body.throughput.map((w: { week: string }) => w.week)).toEqual([
      '2025-06-09',
      '2025-06-16',
      '2025-06-23',
      '2025-06-30',
    ]);
  });
});

describe('GET /api/reserve', () => {
  it('forecasts each cohort from the fit, per currency, and the CSV is the JSON', async () => {
    const mfr = await createOrganization(t.ds, 'manufacturer');
    const contractor = await createOrganization(t.ds, 'contractor');
    const product = await createProduct(t.ds, mfr);
    const { versions } = await createPolicy(
      t.ds,
      mfr,
      [product],
      [{ effectiveFrom: '2020-01-01', unitCredit: '100.00' }],
    );
    const asOf = '2025-06-30';
    const inst = await insertInstallations(t.ds, contractor, product, [
      { installDate: '2023-03-10', quantity: 200, policyVersionId: versions[0].id },
      { installDate: '2024-03-10', quantity: 100, policyVersionId: versions[0].id },
      { installDate: '2024-03-20', quantity: 50, policyVersionId: versions[0].id },
      { installDate: '2024-09-05', quantity: 80, policyVersionId: null }, // no policy: in the fit, not in the reserve
    ]);
    await insertClaims(t.ds, inst, [
      { installationId: inst[0].id, failedOn: '2023-09-01', units: 3 },
      { installationId: inst[0].id, failedOn: '2024-06-01', units: 5 },
      { installationId: inst[1].id, failedOn: '2024-10-01', units: 2 },
      { installationId: inst[3].id, failedOn: '2025-02-01', units: 1 },
    ]);
    const accountant = await member(mfr, ['accountant']);
    const r = await accountant.get(`/api/reserve?asOf=${asOf}&months=12`);
    expect(r.status).toBe(200);
    expect(r.body.monthLabels[0]).toBe('2025-07');
    expect(r.body.monthLabels[11]).toBe('2026-06');

    // The life data at mid-month ages (whole months completed + 0.5), read off the dates by hand:
    //   failures: 3 at 5.5 (2023-03-10 -> 2023-09-01), 5 at 14.5 (-> 2024-06-01), 2 at 6.5 (2024-03-10 ->
    //   2024-10-01), 1 at 4.5 (2024-09-05 -> 2025-02-01); survivors on 2025-06-30: 192 at 27.5, 98 + 50 at 15.5,
    //   79 at 9.5.
    const failures: [number, number][] = [
      [5.5, 3],
      [14.5, 5],
      [6.5, 2],
      [4.5, 1],
    ];
    const survivors: [number, number][] = [
      [27.5, 192],
      [15.5, 148],
      [9.5, 79],
    ];
    const { shape, scale } = r.body.fits[0];
    // The fit is the maximum of the likelihood: both score equations, written out, vanish there.
    //   d lnL / d scale = 0  <=>  sum_all w (t/scale)^shape = r  (r = 11 failures)
    //   d lnL / d shape = 0  <=>  r/shape + sum_f w ln(t/scale) - sum_all w (t/scale)^shape ln(t/scale) = 0
    const all = [...failures, ...survivors];
    const z = (t: number) => Math.pow(t / scale, shape);
    expect(all.reduce((sum, [t, w]) => sum + w * z(t), 0)).toBeCloseTo(11, 8);
    expect(
      11 / shape +
        failures.reduce((sum, [t, w]) => sum + w * Math.log(t / scale), 0) -
        all.reduce((sum, [t, w]) => sum + w * z(t) * Math.log(t / scale), 0),
    ).toBeCloseTo(0, 8);

    // The reserve by hand from that fit: cohort a, 192 units at 27 whole months (27.5 counted), cohort b, 148 at
    // 15 (15.5 counted); term 60, full cover to 36 months, 100.00 a claim, 12 months. A claim at age t pays
    // q(t) = 1 below 36, (60 - t) / 24 from 36 to 60; the expected cents of a cohort of n units at age a are
    //   10000 n integral_a^(a+12) q(t) f(t) dt / R(a),
    // integrated here by Simpson's rule.
    const f = (t: number) => (shape / scale) * Math.pow(t / scale, shape - 1) * Math.exp(-z(t));
    const q = (t: number) => (t < 36 ? 1 : (60 - t) / 24);
    const simpson = (g: (t: number) => number, lo: number, hi: number, n = 2400) => {
      const h = (hi - lo) / n;
      let sum = g(lo) + g(hi);
      for (let i = 1; i < n; i++) sum += (i % 2 ? 4 : 2) * g(lo + i * h);
      return (sum * h) / 3;
    };
    const cents = (n: number, a: number) =>
      // q has a kink at 36: integrate each side of it on its own.
      (10000 *
        n *
        (a + 12 <= 36
          ? simpson((t) => f(t), a, a + 12)
          : simpson((t) => f(t), a, 36) + simpson((t) => q(t) * f(t), 36, a + 12))) /
      Math.exp(-z(a));
    const claims = (n: number, a: number) => n * (1 - Math.exp(z(a) - z(a + 12)));
    const exact = cents(192, 27.5) + cents(148, 15.5);
    expect(r.body.totals[0].currency).toBe('USD');
    expect(r.body.totals[0].expectedClaims).toBeCloseTo(claims(192, 27.5) + claims(148, 15.5), 9);
    expect(r.body.totals[0].amount).toBe((Math.floor(exact + 0.5) / 100).toFixed(2));
    expect(r.body.cohorts).toHaveLength(2);
    expect(r.body.fits).toEqual([
      { productModelId: product.id, modelNumber: product.modelNumber, shape, scale, from: 'model' },
    ]);
    const march = r.body.cohorts.find((c: { installMonth: string }) => c.installMonth === '2024-03');
    expect(march.survivors).toBe(148);

    const months = csvRows((await accountant.get(`/api/reserve?asOf=${asOf}&format=csv&table=months`)).text);
    expect(months[0]).toEqual(['currency', 'month', 'expectedClaims', 'amount']);
    expect(months.slice(1).map((row) => row[3])).toEqual(r.body.totals[0].monthlyAmounts);
    expect(months.slice(1).map((row) => Number(row[2]))).toEqual(r.body.totals[0].monthlyClaims);
    const cohorts = csvRows(
      (await accountant.get(`/api/reserve?asOf=${asOf}&format=csv&table=cohorts`)).text,
    );
    expect(cohorts.slice(1).map((row) => row[8])).toEqual(
      r.body.cohorts.map((c: { amount: string }) => c.amount),
    );

    // Another manufacturer's accountant sees none of it.
    const other = await member(await createOrganization(t.ds, 'manufacturer'), ['accountant']);
    const o = await other.get(`/api/reserve?asOf=${asOf}`);
    expect(o.body).toMatchObject({ totals: [], cohorts: [], fits: [] });
  });
});
