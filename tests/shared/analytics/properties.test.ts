import fc from 'fast-check';
import { describe, expect, it } from 'vitest';

import { kaplanMeier } from '../../../shared/analytics/kaplan-meier';
import { expectedClaims, forecastReserve, monthlyExpectedClaims } from '../../../shared/analytics/reserve';
import { fitWeibull, plottingPositions, type LifeGroup } from '../../../shared/analytics/weibull';

// Times across many orders of magnitude, including near-ties, with counts from 1 to a large group.
const time = fc.oneof(
  fc.double({ min: 1e-3, max: 1e7, noNaN: true, noDefaultInfinity: true }),
  fc.integer({ min: 1, max: 120 }),
);
// Failure groups stay smaller: the regression visits every failed unit, the likelihood only every group.
const group = (max: number) => fc.record({ time, count: fc.integer({ min: 1, max }) });
const entries = (max: number, count = 100_000) => fc.array(fc.oneof(time, group(count)), { maxLength: max });
const lifeData = fc
  .tuple(time, time, entries(20, 5_000), entries(30))
  // Two failures distinct to the fit's precision (relative 1e-9; nearer times are one time).
  .filter(([a, b]) => Math.abs(Math.log(a) - Math.log(b)) > 2e-9)
  .map(([a, b, failures, suspensions]) => ({ failures: [a, b, ...failures], suspensions }));

const groupsOf = (list: readonly (number | LifeGroup)[]) =>
  list.map((e) => (typeof e === 'number' ? { time: e, count: 1 } : e));

describe('properties', () => {
  it('the fit never throws on valid data with two or more distinct failures, and answers finite parameters', () => {
    fc.assert(
      fc.property(lifeData, fc.constantFrom('mle' as const, 'mrr' as const), (data, method) => {
        const result = fitWeibull(data, { method });
        expect(result.ok).toBe(true);
        if (!result.ok) return;
        expect(Number.isFinite(result.fit.shape) && result.fit.shape > 0).toBe(true);
        expect(Number.isFinite(result.fit.scale) && result.fit.scale > 0).toBe(true);
      }),
      { numRuns: 300, seed: 720753371 },
    );
  });

  it('plotting positions rise and stay inside (0, 1)', () => {
    fc.assert(
      fc.property(lifeData, (data) => {
        const F = plottingPositions(data).map((p) => p.F);
        for (let i = 0; i < F.length; i++) {
          expect(F[i] > 0 && F[i] < 1).toBe(true);
          if (i > 0) expect(F[i]).toBeGreaterThan(F[i - 1]);
        }
      }),
    );
  });

  it('Kaplan-Meier survival never rises, and the band holds S inside [0, 1]', () => {
    fc.assert(
      fc.property(entries(40), entries(40), (failures, suspensions) => {
        const rows = kaplanMeier({ failures: groupsOf(failures), suspensions: groupsOf(suspensions) });
        let previous = 1;
        for (const row of rows) {
          expect(row.survival).toBeLessThanOrEqual(previous);
          expect(row.lower <= row.survival && row.survival <= row.upper).toBe(true);
          expect(row.lower >= 0 && row.upper <= 1).toBe(true);
          previous = row.survival;
        }
      }),
    );
  });

  it('reserve expectations are never negative and never exceed the survivors', () => {
    const life = fc.record({
      shape: fc.double({ min: 0.2, max: 12, noNaN: true }),
      scale: fc.double({ min: 0.5, max: 5000, noNaN: true }),
    });
    fc.assert(
      fc.property(
        life,
        fc.integer({ min: 0, max: 1_000_000 }),
        fc.integer({ min: 0, max: 600 }),
        fc.integer({ min: 1, max: 36 }),
        fc.option(fc.integer({ min: 1, max: 240 }), { nil: null }),
        (model, survivors, age, months, term) => {
          const total = expectedClaims(model, survivors, age, months, term);
          expect(total >= 0 && total <= survivors).toBe(true);
          const monthly = monthlyExpectedClaims(model, survivors, age, months, term);
          for (const m of monthly) expect(m >= 0 && m <= survivors).toBe(true);
          expect(monthly.reduce((s, m) => s + m, 0)).toBeLessThanOrEqual(survivors * (1 + 1e-12));
          const forecast = forecastReserve(
            [
              {
                key: 'p',
                survivors,
                ageMonths: age,
                life: model,
                termMonths: term,
                fullCoverageMonths: term === null ? null : Math.floor(term / 2),
                unitCredit: '12.34',
                currency: 'USD',
              },
            ],
            { months },
          );
          for (const amount of forecast.cohorts[0].monthlyAmounts) expect(amount.startsWith('-')).toBe(false);
          expect(Number(forecast.totals[0].amount)).toBeLessThanOrEqual(survivors * 12.34 + 0.01);
        },
      ),
    );
  });
});
