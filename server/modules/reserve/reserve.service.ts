import { parseCents } from '../../../shared/engine/money';
import { forecastReserve, type ReserveCohort } from '../../../shared/analytics/reserve';
import type { WeibullParameters } from '../../../shared/analytics/weibull';
import type { ReserveCohortDto, ReserveDto } from '../../../shared/schemas/analytics';
import { mergeLife, type AnalyticsService } from '../analytics/analytics.service';

// The warranty reserve: each model's units are fitted in months (maximum likelihood, mid-month ages); a model
// with too few failures of its own borrows its family's fit; each cohort (model x install month x policy
// version) then expects claims from the fit, conditional on its survivors working today, capped at its term and
// prorated by its coverage, at its version's unit credit. Ages are whole months completed, which the forecast
// counts at the middle of the month (MID_MONTH) exactly as the fit's mid-month ages do. Cohorts of the same
// install month whose units reached different whole-month ages (installed early or late in the month) are
// forecast apart and added up before rounding.

function addMonths(isoMonth: string, k: number): string {
  const [y, m] = isoMonth.split('-').map(Number);
  const i = y * 12 + (m - 1) + k;
  return `${Math.floor(i / 12)}-${String((i % 12) + 1).padStart(2, '0')}`;
}

export async function buildReserve(
  service: AnalyticsService,
  manufacturerId: string,
  asOf: string,
  months: number,
): Promise<ReserveDto> {
  const [lifeByModel, groups] = await Promise.all([
    service.lifeDataByModel(manufacturerId, { asOf, midpoint: true }),
    service.reserveCohorts(manufacturerId, asOf),
  ]);

  const models = new Map<string, { modelNumber: string; family: string }>();
  for (const g of groups) models.set(g.productModelId, { modelNumber: g.modelNumber, family: g.family });
  const familyOf = new Map<string, string[]>();
  for (const [id, m] of models) familyOf.set(m.family, [...(familyOf.get(m.family) ?? []), id]);

  const fits = new Map<string, { life: WeibullParameters; from: 'model' | 'family' }>();
  const familyFits = new Map<string, WeibullParameters | null>();
  const fitsOut: ReserveDto['fits'] = [];
  for (const [id, m] of models) {
    const own = lifeByModel.get(id);
    const result = own ? service.fit(own) : null;
    if (result?.ok) {
      fits.set(id, { life: result.fit, from: 'model' });
    } else {
      if (!familyFits.has(m.family)) {
        // Every model of the family the manufacturer has installed, not only those in cohorts.
        const lives = [...lifeByModel.entries()]
          .filter(([mid]) => (familyOf.get(m.family) ?? []).includes(mid))
          .map(([, l]) => l);
        const fam = lives.length ? service.fit(mergeLife(lives)) : null;
        familyFits.set(m.family, fam?.ok ? fam.fit : null);
      }
      const fam = familyFits.get(m.family);
      if (fam) fits.set(id, { life: fam, from: 'family' });
    }
    const f = fits.get(id);
    if (f)
      fitsOut.push({
        productModelId: id,
        modelNumber: m.modelNumber,
        shape: f.life.shape,
        scale: f.life.scale,
        from: f.from,
      });
  }

  const cohorts: ReserveCohort[] = [];
  const meta = new Map<
    string,
    Omit<ReserveCohortDto, keyof ReturnType<typeof forecastReserve>['cohorts'][number]>
  >();
  const unforecast = new Map<string, ReserveDto['unforecast'][number]>();
  for (const g of groups) {
    if (g.survivors <= 0 || g.ageMonths >= g.termMonths) continue; // nothing left to claim under this term
    const f = fits.get(g.productModelId);
    if (!f) {
      const u = unforecast.get(g.productModelId) ?? {
        productModelId: g.productModelId,
        modelNumber: g.modelNumber,
        survivors: 0,
        reason: 'Too few covered failures to fit, for the model and for its family.',
      };
      u.survivors += g.survivors;
      unforecast.set(g.productModelId, u);
      continue;
    }
    const key = `${g.productModelId}|${g.installMonth}|${g.policyVersionId}`;
    cohorts.push({
      key,
      survivors: g.survivors,
      ageMonths: g.ageMonths,
      life: f.life,
      termMonths: g.termMonths,
      fullCoverageMonths: g.fullCoverageMonths,
      unitCredit: g.unitCredit,
      currency: g.currency,
    });
    const m = meta.get(key);
    if (m) {
      m.survivors += g.survivors;
      m.ageMonths = Math.min(m.ageMonths, g.ageMonths);
    } else {
      meta.set(key, {
        productModelId: g.productModelId,
        modelNumber: g.modelNumber,
        installMonth: g.installMonth,
        ageMonths: g.ageMonths,
        survivors: g.survivors,
        termMonths: g.termMonths,
        unitCredit: g.unitCredit,
        fitFrom: f.from,
      });
    }
  }

  // Cohorts of one key (an install month whose units reached two whole-month ages) come back as one row, their
  // unrounded amounts added before rounding; the totals are the unrounded sums, rounded once.
  const forecast = forecastReserve(cohorts, { months });
  const merged = new Map<string, ReserveCohortDto>();
  for (const row of forecast.cohorts) merged.set(row.key, { ...row, ...meta.get(row.key)! });
  const rows = [...merged.values()].sort(
    (a, b) => parseCents(b.amount) - parseCents(a.amount) || a.key.localeCompare(b.key),
  );
  const first = asOf.slice(0, 7);
  return {
    asOf,
    months,
    monthLabels: Array.from({ length: months }, (_, k) => addMonths(first, k + 1)),
    totals: forecast.totals,
    cohorts: rows,
    unforecast: [...unforecast.values()],
    fits: fitsOut,
  };
}
