import { fitWeibull, type LifeGroup, type WeibullFitResult } from '../../../shared/analytics/weibull';
import type { ClaimRow } from '../../../shared/analytics/failure-modes';
import type { AgeingCount } from '../../../shared/analytics/failure-modes';
import { OPEN_STAGES } from '../../../shared/schemas/claims';
import { AGE_BANDS, type PopulationDto } from '../../../shared/schemas/analytics';
import { FAMILY_LABELS, type ProductFamily } from '../../../shared/schemas/catalogue';
import type { AppDataSource } from '../../db/data-source';
import { ageSql, ambientBandSql, coveredClaimSql, failureModeSql, wholeMonthsSql } from './analytics.sql';

// Every query here is scoped to one manufacturer and aggregates in SQL: the answers are grouped counts (a few
// hundred rows for a million installed units), which the shared functions turn into fits, tables and forecasts.

export type Population =
  | { kind: 'model'; productModelId: string; label: string }
  | { kind: 'family'; family: ProductFamily; label: string }
  | { kind: 'lot'; lot: string; label: string };

export type GroupedLife = {
  failures: LifeGroup[];
  suspensions: LifeGroup[];
  units: number;
  failed: number;
  excessFailures: number;
};

type Row = Record<string, string | number | null>;
const num = (v: unknown) => (v === null || v === undefined ? 0 : Number(v));

function populationFilter(p: Population): { sql: string; params: string[] } {
  if (p.kind === 'model') return { sql: 'i.product_model_id = ?', params: [p.productModelId] };
  if (p.kind === 'family') return { sql: 'pm.family = ?', params: [p.family] };
  return { sql: 'i.lot = ?', params: [p.lot] };
}

export function presentPopulation(p: Population): PopulationDto {
  if (p.kind === 'model') return { kind: 'model', label: p.label, productModelId: p.productModelId };
  if (p.kind === 'family') return { kind: 'family', label: p.label, family: p.family };
  return { kind: 'lot', label: p.label, lot: p.lot };
}

/**
 * The life data's SQL: each installation's covered claims in failure-date order, each cut to what is left of
 * the quantity (as installedLifeData cuts them), then failures grouped by age at failure and survivors by age
 * on asOf. `groupBy` adds a column (the model) to every group.
 */
function lifeSql(opts: { unit: 'months' | 'hours'; midpoint: boolean; where: string; groupBy?: string }) {
  const g = opts.groupBy ? `${opts.groupBy} AS grp, ` : `'' AS grp, `;
  const gBy = opts.groupBy ? `grp, ` : `grp, `;
  const failAge = ageSql(
    opts.unit,
    'inst.install_date',
    'counted.failed_on',
    'inst.hours_per_day',
    opts.midpoint,
  );
  const survAge = ageSql(opts.unit, 'inst.install_date', 'inst.as_of', 'inst.hours_per_day', opts.midpoint);
  return `
WITH p AS (SELECT CAST(? AS DATE) AS as_of),
inst AS (
  SELECT i.id, i.quantity, i.install_date, i.hours_per_day, i.product_model_id, pm.family, p.as_of
  FROM installations i JOIN product_models pm ON pm.id = i.product_model_id CROSS JOIN p
  WHERE i.manufacturer_id = ? AND ${opts.where} AND i.install_date <= p.as_of
),
fc AS (
  SELECT c.installation_id, c.failed_on, COALESCE(c.units, 1) AS claimed,
    SUM(COALESCE(c.units, 1)) OVER (PARTITION BY c.installation_id ORDER BY c.failed_on, c.id ROWS UNBOUNDED PRECEDING) AS upto
  FROM claims c JOIN inst ON inst.id = c.installation_id
  WHERE c.manufacturer_id = ? AND ${coveredClaimSql('c')} AND c.failed_on IS NOT NULL AND c.failed_on <= inst.as_of
),
counted AS (
  SELECT fc.installation_id, fc.failed_on, fc.claimed,
    LEAST(fc.claimed, GREATEST(0, inst.quantity - (fc.upto - fc.claimed))) AS n
  FROM fc JOIN inst ON inst.id = fc.installation_id
),
per_installation AS (
  SELECT installation_id, SUM(n) AS failed FROM counted GROUP BY installation_id
)
SELECT ${g}'f' AS kind, ${failAge} AS age, SUM(counted.n) AS n, SUM(counted.claimed - counted.n) AS excess
  FROM counted JOIN inst ON inst.id = counted.installation_id GROUP BY ${gBy}age
UNION ALL
SELECT ${g}'s' AS kind, ${survAge} AS age, SUM(inst.quantity - COALESCE(p.failed, 0)) AS n, 0 AS excess
  FROM inst LEFT JOIN per_installation p ON p.installation_id = inst.id GROUP BY ${gBy}age`;
}

function toGrouped(rows: Row[]): Map<string, GroupedLife> {
  const out = new Map<string, GroupedLife>();
  for (const r of rows) {
    const key = String(r.grp ?? '');
    const g = out.get(key) ?? { failures: [], suspensions: [], units: 0, failed: 0, excessFailures: 0 };
    const n = num(r.n);
    const time = num(r.age);
    if (r.kind === 'f') {
      if (n > 0) g.failures.push({ time, count: n });
      g.failed += n;
      g.units += n;
      g.excessFailures += num(r.excess);
    } else {
      if (n > 0) g.suspensions.push({ time, count: n });
      g.units += n;
    }
    out.set(key, g);
  }
  for (const g of out.values()) {
    g.failures.sort((a, b) => a.time - b.time);
    g.suspensions.sort((a, b) => a.time - b.time);
  }
  return out;
}

export function mergeLife(list: readonly GroupedLife[]): GroupedLife {
  const f = new Map<number, number>();
  const s = new Map<number, number>();
  const out: GroupedLife = { failures: [], suspensions: [], units: 0, failed: 0, excessFailures: 0 };
  for (const g of list) {
    for (const x of g.failures) f.set(x.time, (f.get(x.time) ?? 0) + x.count);
    for (const x of g.suspensions) s.set(x.time, (s.get(x.time) ?? 0) + x.count);
    out.units += g.units;
    out.failed += g.failed;
    out.excessFailures += g.excessFailures;
  }
  out.failures = [...f].map(([time, count]) => ({ time, count })).sort((a, b) => a.time - b.time);
  out.suspensions = [...s].map(([time, count]) => ({ time, count })).sort((a, b) => a.time - b.time);
  return out;
}

export const EMPTY_LIFE: GroupedLife = {
  failures: [],
  suspensions: [],
  units: 0,
  failed: 0,
  excessFailures: 0,
};

export function createAnalyticsService(ds: AppDataSource) {
  return {
    async findModel(id: string) {
      const rows: Row[] = await ds.query(
        'SELECT id, manufacturer_id, model_number, name, family FROM product_models WHERE id = ?',
        [id],
      );
      const r = rows[0];
      return r
        ? {
            id: String(r.id),
            manufacturerId: String(r.manufacturer_id),
            modelNumber: String(r.model_number),
            name: String(r.name),
            family: r.family as ProductFamily,
          }
        : null;
    },

    /** Whether the manufacturer has any installation of this family or lot (else the population is unknown: 404). */
    async hasPopulation(manufacturerId: string, p: Population): Promise<boolean> {
      const f = populationFilter(p);
      const rows: Row[] = await ds.query(
        `SELECT 1 AS x FROM installations i JOIN product_models pm ON pm.id = i.product_model_id WHERE i.manufacturer_id = ? AND ${f.sql} LIMIT 1`,
        [manufacturerId, ...f.params],
      );
      return rows.length > 0;
    },

    familyLabel: (family: ProductFamily) => FAMILY_LABELS[family],

    /** Grouped life data of one population (installedLifeData's answer, counted by the database). */
    async lifeData(
      manufacturerId: string,
      p: Population,
      opts: { asOf: string; unit: 'months' | 'hours'; midpoint: boolean },
    ) {
      const f = populationFilter(p);
      const rows: Row[] = await ds.query(
        lifeSql({ unit: opts.unit, midpoint: opts.midpoint, where: f.sql }),
        [opts.asOf, manufacturerId, ...f.params, manufacturerId],
      );
      return toGrouped(rows).get('') ?? EMPTY_LIFE;
    },

    /** Life data of every model of the manufacturer at once, in months, keyed by model id. */
    async lifeDataByModel(manufacturerId: string, opts: { asOf: string; midpoint: boolean }) {
      const rows: Row[] = await ds.query(
        lifeSql({
          unit: 'months',
          midpoint: opts.midpoint,
          where: '1 = 1',
          groupBy: 'inst.product_model_id',
        }),
        [opts.asOf, manufacturerId, manufacturerId],
      );
      return toGrouped(rows);
    },

    /** Covered claims grouped three ways: by mode and environment, by lot and contractor, by install month and age. */
    async failureGroups(manufacturerId: string, p: Population, asOf: string) {
      const f = populationFilter(p);
      const from = `FROM claims c JOIN installations i ON i.id = c.installation_id JOIN product_models pm ON pm.id = i.product_model_id
        JOIN organizations o ON o.id = c.contractor_id
        WHERE c.manufacturer_id = ? AND i.manufacturer_id = ? AND ${f.sql} AND ${coveredClaimSql('c')} AND c.failed_on IS NOT NULL AND c.failed_on <= ?`;
      const params = [manufacturerId, manufacturerId, ...f.params, asOf];
      const env: Row[] = await ds.query(
        `SELECT ${failureModeSql('c')} AS mode, i.location, i.enclosure, i.dimmer, i.nominal_supply_volts AS supply, ${ambientBandSql('i.ambient_c')} AS band,
           COUNT(*) AS claims, SUM(COALESCE(c.units, 1)) AS units ${from}
         GROUP BY mode, i.location, i.enclosure, i.dimmer, supply, band`,
        params,
      );
      const lots: Row[] = await ds.query(
        `SELECT i.lot, o.name AS contractor, COUNT(*) AS claims, SUM(COALESCE(c.units, 1)) AS units ${from}
         GROUP BY i.lot, o.name`,
        params,
      );
      const ageing: Row[] = await ds.query(
        `SELECT DATE_FORMAT(i.install_date, '%Y-%m') AS month, ${wholeMonthsSql('i.install_date', 'c.failed_on')} AS age, COUNT(*) AS claims ${from}
         GROUP BY month, age`,
        params,
      );
      const envRows: ClaimRow[] = env.map((r) => ({
        failureMode: String(r.mode),
        installedOn: '',
        failedOn: '',
        claims: num(r.claims),
        units: num(r.units),
        location: r.location as string | null,
        enclosure: r.enclosure as string | null,
        dimmer: r.dimmer as string | null,
        supply: r.supply === null ? null : `${num(r.supply)} V`,
        ambientBand: r.band as string | null,
      }));
      const lotRows: ClaimRow[] = lots.map((r) => ({
        failureMode: '',
        installedOn: '',
        failedOn: '',
        claims: num(r.claims),
        units: num(r.units),
        lot: r.lot as string | null,
        contractor: r.contractor as string | null,
      }));
      const cells: AgeingCount[] = ageing.map((r) => ({
        installMonth: String(r.month),
        monthsInService: num(r.age),
        claims: num(r.claims),
      }));
      return { envRows, lotRows, cells };
    },

    /** Open claims by days since filing and who they wait on; decisions per week from the audit trail. */
    async claimsAgeing(manufacturerId: string, asOf: string, weeks: number) {
      const open = OPEN_STAGES.filter((s) => s !== 'draft');
      const bands: Row[] = await ds.query(
        `SELECT CASE WHEN d <= 7 THEN 0 WHEN d <= 14 THEN 1 WHEN d <= 30 THEN 2 WHEN d <= 60 THEN 3 WHEN d <= 90 THEN 4 ELSE 5 END AS band,
            SUM(waiting_on = 'contractor') AS contractor, SUM(waiting_on IS NULL OR waiting_on = 'manufacturer') AS manufacturer
         FROM (SELECT GREATEST(0, DATEDIFF(CAST(? AS DATE), DATE(c.filed_at))) AS d, c.waiting_on FROM claims c
               WHERE c.manufacturer_id = ? AND c.stage IN (${open.map(() => '?').join(', ')}) AND c.filed_at IS NOT NULL AND DATE(c.filed_at) <= ?) x
         GROUP BY band`,
        [asOf, manufacturerId, ...open, asOf],
      );
      const byBand = new Map(bands.map((r) => [num(r.band), r]));
      const openRows = AGE_BANDS.map((band, i) => {
        const r = byBand.get(i);
        const manufacturer = num(r?.manufacturer);
        const contractor = num(r?.contractor);
        return { band, manufacturer, contractor, total: manufacturer + contractor };
      });
      const decided: Row[] = await ds.query(
        `SELECT DATE_FORMAT(DATE_SUB(DATE(occurred_at), INTERVAL WEEKDAY(occurred_at) DAY), '%Y-%m-%d') AS week,
            SUM(action = 'claim.approved') AS approved, SUM(action = 'claim.denied') AS denied
         FROM audit_events
         WHERE organization_id = ? AND entity_type = 'Claim' AND action IN ('claim.approved', 'claim.denied')
           AND occurred_at >= DATE_SUB(CAST(? AS DATE), INTERVAL ? DAY) AND occurred_at < DATE_ADD(CAST(? AS DATE), INTERVAL 1 DAY)
         GROUP BY week`,
        [manufacturerId, asOf, weeks * 7 + 7, asOf],
      );
      const byWeek = new Map(decided.map((r) => [String(r.week), r]));
      const asOfDate = new Date(`${asOf}T00:00:00Z`);
      const monday = new Date(asOfDate.getTime() - ((asOfDate.getUTCDay() + 6) % 7) * 86_400_000);
      const throughput = Array.from({ length: weeks }, (_, k) => {
        const week = new Date(monday.getTime() - (weeks - 1 - k) * 7 * 86_400_000).toISOString().slice(0, 10);
        const r = byWeek.get(week);
        const approved = num(r?.approved);
        const denied = num(r?.denied);
        return { week, approved, denied, decided: approved + denied };
      });
      return { open: openRows, throughput };
    },

    /** Survivors today by model, install month and policy version (with its terms), at whole-month ages. */
    async reserveCohorts(manufacturerId: string, asOf: string) {
      const rows: Row[] = await ds.query(
        `WITH p AS (SELECT CAST(? AS DATE) AS as_of),
         failed AS (
           SELECT c.installation_id, SUM(COALESCE(c.units, 1)) AS n FROM claims c CROSS JOIN p
           WHERE c.manufacturer_id = ? AND ${coveredClaimSql('c')} AND c.failed_on IS NOT NULL AND c.failed_on <= p.as_of
           GROUP BY c.installation_id
         )
         SELECT i.product_model_id AS model, pm.model_number, pm.family, DATE_FORMAT(i.install_date, '%Y-%m') AS month, i.policy_version_id AS pv,
             ${wholeMonthsSql('i.install_date', 'p.as_of')} AS age,
             SUM(GREATEST(0, i.quantity - COALESCE(f.n, 0))) AS survivors,
             v.term_months, v.full_coverage_months, v.unit_credit, v.currency
         FROM installations i
           JOIN product_models pm ON pm.id = i.product_model_id
           JOIN warranty_policy_versions v ON v.id = i.policy_version_id
           LEFT JOIN failed f ON f.installation_id = i.id
           CROSS JOIN p
         WHERE i.manufacturer_id = ? AND i.install_date <= p.as_of
         GROUP BY model, month, pv, age`,
        [asOf, manufacturerId, manufacturerId],
      );
      return rows.map((r) => ({
        productModelId: String(r.model),
        modelNumber: String(r.model_number),
        family: r.family as ProductFamily,
        installMonth: String(r.month),
        policyVersionId: String(r.pv),
        ageMonths: num(r.age),
        survivors: num(r.survivors),
        termMonths: num(r.term_months),
        fullCoverageMonths: num(r.full_coverage_months),
        unitCredit: String(r.unit_credit),
        currency: String(r.currency),
      }));
    },

    fit(life: GroupedLife, method: 'mle' | 'mrr' = 'mle'): WeibullFitResult {
      return fitWeibull({ failures: life.failures, suspensions: life.suspensions }, { method });
    },
  };
}

export type AnalyticsService = ReturnType<typeof createAnalyticsService>;
