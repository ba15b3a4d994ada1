import { describe, expect, it } from 'vitest';

import { installedLifeData } from '../../../shared/analytics/life-data';
import {
  expectedClaims,
  forecastReserve,
  MID_MONTH,
  RESERVE_AGE_RULE,
  RESERVE_ROUNDING_RULE,
  type ReserveCohort,
} from '../../../shared/analytics/reserve';
import { AnalyticsInputError } from '../../../shared/analytics/validation';

// Every expected value below is computed in the test from the Weibull formulas written out here, never from the
// module's own functions:
//   H(t) = (t / scale)^shape,  R(t) = exp(-H(t)),  f(t) = (shape / scale) (t / scale)^(shape - 1) R(t).
const H = (t: number, shape: number, scale: number) => Math.pow(t / scale, shape);
const R = (t: number, shape: number, scale: number) => Math.exp(-H(t, shape, scale));
const f = (t: number, shape: number, scale: number) =>
  (shape / scale) * Math.pow(t / scale, shape - 1) * R(t, shape, scale);

/** Composite Simpson's rule with n (even) panels: the test's own numerical integration. */
function simpson(g: (t: number) => number, a: number, b: number, n = 2000): number {
  const h = (b - a) / n;
  let sum = g(a) + g(b);
  for (let i = 1; i < n; i++) sum += (i % 2 === 1 ? 4 : 2) * g(a + i * h);
  return (sum * h) / 3;
}

const cohort = (overrides: Partial<ReserveCohort>): ReserveCohort => ({
  key: 'demo',
  survivors: 1000,
  ageMonths: 12,
  life: { shape: 2, scale: 100 },
  termMonths: null,
  fullCoverageMonths: null,
  unitCredit: '85.00',
  currency: 'USD',
  ...overrides,
});

describe('reserve: one age for the fit and the forecast', () => {
  it('the fit and the forecast both count a unit at the middle of its month', () => {
    // Installed 2024-01-15, looked at on 2024-03-20: two whole months completed, counted at 2.5 by the fit.
    const life = installedLifeData([{ installedOn: '2024-01-15', quantity: 1 }], {
      asOf: '2024-03-20',
      unit: 'months',
      age: 'midpoint',
    });
    expect(life.suspensions).toEqual([{ time: 2.5, count: 1 }]);
    expect(2 + MID_MONTH).toBe(2.5);
  });

  it('a cohort in the last month of a 60-month term: 22.66 claims per 1,000, not 44.71', () => {
    // Hand computation (shape 1.5, scale 40 months, 59 whole months completed, term 60):
    //   the units are counted at 59.5 months; cover ends at 60 months.
    //   H(59.5) = (59.5 / 40)^1.5 = 1.487 5^1.5 = 1.814 201
    //   H(60)   = (60 / 40)^1.5   = 1.5^1.5     = 1.837 117
    //   claims  = 1000 x (1 - exp(H(59.5) - H(60))) = 1000 x (1 - exp(-0.022 916)) = 22.655
    // (counting them from 59 months instead: 1000 x (1 - exp(H(59) - H(60))) = 44.706, twice as many.)
    const byHand = 1000 * (1 - Math.exp(H(59.5, 1.5, 40) - H(60, 1.5, 40)));
    expect(byHand).toBeCloseTo(22.655, 3);
    const forecast = forecastReserve(
      [
        cohort({
          survivors: 1000,
          ageMonths: 59,
          life: { shape: 1.5, scale: 40 },
          termMonths: 60,
          fullCoverageMonths: 60,
          unitCredit: '120.00',
        }),
      ],
      { months: 12 },
    );
    const row = forecast.cohorts[0];
    expect(row.expectedClaims).toBeCloseTo(byHand, 9);
    expect(row.expectedClaims).toBeCloseTo(22.655, 3);
    expect(row.monthlyClaims.slice(1).every((m) => m === 0)).toBe(true);
    // 22.655 479 5 x 120.00 = 2718.657 54 -> 2718.66
    expect(row.amount).toBe('2718.66');
  });

  it('a wear-out cohort mid-life is not forecast 2 % low', () => {
    // shape 3, scale 100 months, 40 whole months completed, next 12 months, no term:
    //   counted from 40.5 months: 1000 x (1 - exp(H(40.5) - H(52.5))) = 75.288
    //   (from 40 months it would be 1000 x (1 - exp(H(40) - H(52))) = 73.747)
    const byHand = 1000 * (1 - Math.exp(H(40.5, 3, 100) - H(52.5, 3, 100)));
    expect(byHand).toBeCloseTo(75.288, 3);
    const row = forecastReserve([cohort({ ageMonths: 40, life: { shape: 3, scale: 100 } })]).cohorts[0];
    expect(row.expectedClaims).toBeCloseTo(byHand, 9);
  });

  it('expectedClaims takes the model age itself (continuous months) and caps at the term', () => {
    // 200 units at model age 59.5, next 3 months, term 60: only half a month of cover is left.
    const byHand = 200 * (1 - Math.exp(H(59.5, 1.5, 40) - H(60, 1.5, 40)));
    expect(expectedClaims({ shape: 1.5, scale: 40 }, 200, 59.5, 3, 60)).toBeCloseTo(byHand, 12);
    expect(expectedClaims({ shape: 1.5, scale: 40 }, 200, 60, 3, 60)).toBe(0);
  });

  it('the page states the age definition and the rounding rule', () => {
    expect(RESERVE_AGE_RULE).toMatch(/middle of the month/);
    expect(RESERVE_ROUNDING_RULE).toMatch(/rounded once/);
  });
});

describe('reserve: rounding once', () => {
  // Four cohorts whose next month brings 1.061880, 1.421837, 1.071293 and 1.123424 expected claims at 120.00
  // a credit. With shape 1 the chance of failing in any one month is 1 - exp(-1 / scale) whatever the age, so
  // each cohort's scale is chosen as -1 / ln(1 - claims / survivors).
  const claims = [1.06188, 1.421837, 1.071293, 1.123424];
  const cohorts = claims.map((c, i) =>
    cohort({
      key: `c${i}`,
      survivors: 1000,
      ageMonths: 3 + i,
      life: { shape: 1, scale: -1 / Math.log(1 - c / 1000) },
      unitCredit: '120.00',
    }),
  );

  it('totals 561.41 (the unrounded sum rounded), not 561.42 (the rounded rows added)', () => {
    // 120 x (1.061880 + 1.421837 + 1.071293 + 1.123424) = 120 x 4.678434 = 561.412 08 -> 561.41
    // rounded row by row: 127.43 + 170.62 + 128.56 + 134.81 = 561.42
    const forecast = forecastReserve(cohorts, { months: 1 });
    expect(forecast.cohorts.map((c) => c.amount)).toEqual(['127.43', '170.62', '128.56', '134.81']);
    expect(forecast.totals[0].expectedClaims).toBeCloseTo(4.678434, 6);
    expect(forecast.totals[0].amount).toBe('561.41');
    expect(forecast.totals[0].monthlyAmounts).toEqual(['561.41']);
  });

  it('cohorts with one key (two whole-month ages of one install month) add before rounding', () => {
    const [a, b] = cohorts;
    const forecast = forecastReserve([a, { ...b, key: a.key }], { months: 1 });
    // 120 x (1.061880 + 1.421837) = 127.4256 + 170.620 44 = 298.046 04 -> one row of 298.05
    expect(forecast.cohorts).toHaveLength(1);
    expect(forecast.cohorts[0].amount).toBe('298.05');
    expect(forecast.cohorts[0].expectedClaims).toBeCloseTo(1.06188 + 1.421837, 9);
  });

  it('a cohort’s months add up to its total to the cent', () => {
    // 1,000 units at 12 whole months (12.5 counted), shape 2, scale 100, 85.00 a claim, 12 months:
    //   claims = 1000 x (1 - exp(H(12.5) - H(24.5))) = 1000 x (1 - exp(0.015625 - 0.060025)) = 43.4287
    const byHand = 1000 * (1 - Math.exp(H(12.5, 2, 100) - H(24.5, 2, 100)));
    const row = forecastReserve([cohort({})]).cohorts[0];
    expect(row.expectedClaims).toBeCloseTo(byHand, 9);
    const cents = (s: string) => Math.round(Number(s) * 100);
    expect(row.amount).toBe((Math.floor(byHand * 8500 + 0.5) / 100).toFixed(2));
    expect(row.monthlyAmounts.reduce((s, a) => s + cents(a), 0)).toBe(cents(row.amount));
  });

  it('never adds currencies together', () => {
    const forecast = forecastReserve([
      cohort({ key: 'a', currency: 'USD' }),
      cohort({ key: 'b', currency: 'EUR', unitCredit: '40' }),
    ]);
    expect(forecast.totals.map((t) => t.currency)).toEqual(['EUR', 'USD']);
    expect(forecast.totals[1].amount).toBe(forecast.cohorts[0].amount);
  });
});

describe('reserve: a prorating policy uses the linear pro-rata cost', () => {
  it('prices each month by integrating the rebate against the life model', () => {
    // 100 units at 41 whole months (41.5 counted), shape 2, scale 60 months, term 60, full cover to 24, 36.00:
    // month k's credit = 100 x 3600 cents x integral_{41.5+k-1}^{41.5+k} (60 - t) / 36 f(t) dt / R(41.5),
    // integrated here by Simpson's rule.
    const [shape, scale] = [2, 60];
    const monthCents = (k: number) =>
      (100 * 3600 * simpson((t) => ((60 - t) / 36) * f(t, shape, scale), 40.5 + k, 41.5 + k)) /
      R(41.5, shape, scale);
    const exact = [1, 2, 3].map(monthCents);
    const row = forecastReserve(
      [
        cohort({
          survivors: 100,
          ageMonths: 41,
          life: { shape, scale },
          termMonths: 60,
          fullCoverageMonths: 24,
          unitCredit: '36.00',
        }),
      ],
      { months: 3 },
    ).cohorts[0];
    const total = exact.reduce((a, b) => a + b, 0);
    expect(row.exactCents).toBeCloseTo(total, 6);
    expect(row.amount).toBe((Math.floor(total + 0.5) / 100).toFixed(2));
    expect(row.monthlyExactCents[0]).toBeCloseTo(exact[0], 6);
  });
});

describe('reserve: bad terms are refused by name', () => {
  const refusal = (c: Partial<ReserveCohort>, months = 12) => {
    try {
      forecastReserve([cohort(c)], { months });
    } catch (e) {
      expect(e).toBeInstanceOf(AnalyticsInputError);
      return (e as AnalyticsInputError).issues.map((i) => i.path);
    }
    throw new Error('not refused');
  };

  it('a NaN or negative term, a NaN full-coverage period, a bad credit, a bad life model, a bad horizon', () => {
    expect(refusal({ termMonths: NaN })).toEqual(['cohorts.0.termMonths']);
    expect(refusal({ termMonths: -12 })).toEqual(['cohorts.0.termMonths']);
    expect(refusal({ termMonths: 60, fullCoverageMonths: NaN })).toEqual(['cohorts.0.fullCoverageMonths']);
    expect(refusal({ unitCredit: '85.001' })).toEqual(['cohorts.0.unitCredit']);
    expect(refusal({ life: { shape: 0, scale: 10 } })).toEqual(['cohorts.0.life.shape']);
    expect(refusal({}, 0)).toEqual(['options.months']);
    expect(forecastReserve([], {}).totals).toEqual([]);
  });
});
