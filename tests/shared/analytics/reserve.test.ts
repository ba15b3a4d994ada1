import { describe, expect, it } from 'vitest';

import {
  coverageFraction,
  expectedClaims,
  forecastReserve,
  monthlyExpectedClaims,
  type ReserveCohort,
} from '../../../shared/analytics/reserve';

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

describe('warranty reserve', () => {
  it('1,000 units at 12 months, shape 2, scale 100: 42.2802 claims and 3593.81 in the next 12 months', () => {
    const forecast = forecastReserve([cohort({})]);
    expect(forecast.cohorts[0].expectedClaims).toBeCloseTo(42.2802, 4); // computed from the reserve formula
    expect(forecast.cohorts[0].amount).toBe('3593.81'); // computed from the reserve formula
    // A 120-month term changes nothing inside the horizon.
    const longTerm = forecastReserve([cohort({ termMonths: 120, fullCoverageMonths: 120 })]);
    expect(longTerm.cohorts[0].amount).toBe('3593.81'); // computed from the reserve formula
    expect(forecast.totals).toEqual([
      {
        currency: 'USD',
        expectedClaims: forecast.cohorts[0].expectedClaims,
        monthlyClaims: forecast.cohorts[0].monthlyClaims,
        amount: '3593.81',
        monthlyAmounts: forecast.cohorts[0].monthlyAmounts,
      },
    ]);
  });

  it('the months add up to the total, in claims and to the cent', () => {
    const { cohorts } = forecastReserve([cohort({})]);
    const [row] = cohorts;
    expect(row.monthlyClaims).toHaveLength(12);
    expect(row.monthlyClaims.reduce((s, m) => s + m, 0)).toBeCloseTo(row.expectedClaims, 12);
    const cents = row.monthlyAmounts.reduce((s, a) => s + Math.round(Number(a) * 100), 0);
    expect(cents).toBe(359381);
    expect(row.monthlyClaims[0]).toBeCloseTo(expectedClaims({ shape: 2, scale: 100 }, 1000, 12, 1), 14);
  });

  it('shape 1.5, scale 40, term 60, survivors 85/129/115/156 at 4/3/2/1 months: 4.678434 claims next month', () => {
    const life = { shape: 1.5, scale: 40 };
    const cohorts = [
      [85, 4],
      [129, 3],
      [115, 2],
      [156, 1],
    ].map(([survivors, ageMonths]) =>
      cohort({ key: `age ${ageMonths}`, survivors, ageMonths, life, termMonths: 60, fullCoverageMonths: 60 }),
    );
    const forecast = forecastReserve(cohorts, { months: 1 });
    expect(forecast.totals[0].expectedClaims).toBeCloseTo(4.678434, 6); // computed from the reserve formula
  });

  it('200 units at 59 months, next 3 months, term 60: 8.941181, not 25.84 (the term caps it)', () => {
    const life = { shape: 1.5, scale: 40 };
    expect(expectedClaims(life, 200, 59, 3, 60)).toBeCloseTo(8.941181, 6); // computed from the reserve formula
    expect(expectedClaims(life, 200, 59, 3)).toBeCloseTo(25.84, 2); // computed from the reserve formula
    expect(monthlyExpectedClaims(life, 200, 59, 3, 60).slice(1)).toEqual([0, 0]);
    expect(expectedClaims(life, 200, 60, 3, 60)).toBe(0);
  });

  it('prorates the credit by the age at failure, as the engine does', () => {
    expect(coverageFraction(23, 60, 24)).toBe(1);
    expect(coverageFraction(24, 60, 24)).toBe(1);
    expect(coverageFraction(42, 60, 24)).toBe(0.5);
    expect(coverageFraction(60, 60, 24)).toBe(0);
    expect(coverageFraction(500, null, null)).toBe(1);
    // 100 units at 41 months: month 1 fails at 41 months (19/36 coverage), month 2 at 42 months (18/36).
    const life = { shape: 1, scale: 100 };
    const row = forecastReserve(
      [
        cohort({
          survivors: 100,
          ageMonths: 41,
          life,
          termMonths: 60,
          fullCoverageMonths: 24,
          unitCredit: '36.00',
        }),
      ],
      { months: 2 },
    ).cohorts[0];
    const [m1, m2] = monthlyExpectedClaims(life, 100, 41, 2, 60);
    const exact1 = m1 * 3600 * (19 / 36);
    const exact2 = m2 * 3600 * (18 / 36);
    expect(row.amount).toBe((Math.floor(exact1 + exact2 + 0.5) / 100).toFixed(2)); // computed from the reserve formula
    expect(row.monthlyAmounts[0]).toBe((Math.floor(exact1 + 0.5) / 100).toFixed(2));
  });

  it('totals per currency, never across currencies, and the cohorts add up to the cent', () => {
    const forecast = forecastReserve([
      cohort({ key: 'a', currency: 'USD' }),
      cohort({ key: 'b', currency: 'EUR', unitCredit: '40' }),
      cohort({ key: 'c', currency: 'USD', survivors: 500, ageMonths: 30 }),
    ]);
    expect(forecast.totals.map((t) => t.currency)).toEqual(['EUR', 'USD']);
    const usd = forecast.totals[1];
    const cents = (a: string) => Math.round(Number(a) * 100);
    expect(cents(usd.amount)).toBe(cents(forecast.cohorts[0].amount) + cents(forecast.cohorts[2].amount));
    expect(usd.monthlyAmounts.reduce((s, a) => s + cents(a), 0)).toBe(cents(usd.amount));
    expect(usd.expectedClaims).toBeCloseTo(
      forecast.cohorts[0].expectedClaims + forecast.cohorts[2].expectedClaims,
      10,
    );
  });

  it('refuses a bad credit, a bad life model, a bad horizon', () => {
    expect(() => forecastReserve([cohort({ unitCredit: '85.001' })])).toThrow(/unit credit/);
    expect(() => forecastReserve([cohort({ life: { shape: 0, scale: 10 } })])).toThrow(/shape and scale/);
    expect(() => forecastReserve([cohort({})], { months: 0 })).toThrow(RangeError);
    expect(forecastReserve([], {}).totals).toEqual([]);
  });
});
