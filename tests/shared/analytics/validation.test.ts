import { describe, expect, it } from 'vitest';

import * as covered from '../../../shared/analytics/covered';
import * as failureModeRules from '../../../shared/analytics/failure-mode-rules';
import * as failureModes from '../../../shared/analytics/failure-modes';
import * as gamma from '../../../shared/analytics/gamma';
import * as kaplanMeier from '../../../shared/analytics/kaplan-meier';
import * as lifeData from '../../../shared/analytics/life-data';
import * as reserve from '../../../shared/analytics/reserve';
import { AnalyticsInputError } from '../../../shared/analytics/validation';
import * as warrantyCost from '../../../shared/analytics/warranty-cost';
import * as weibull from '../../../shared/analytics/weibull';

const cohort = {
  key: 'k',
  survivors: 100,
  ageMonths: 10,
  life: { shape: 1.5, scale: 40 },
  termMonths: 60 as number | null,
  fullCoverageMonths: 24 as number | null,
  unitCredit: '120.00',
  currency: 'USD',
};

function pathsOf(run: () => unknown): string[] {
  try {
    run();
  } catch (e) {
    if (e instanceof AnalyticsInputError) return e.issues.map((i) => i.path);
    throw e;
  }
  throw new Error('accepted');
}

describe('bad input is refused by name (issue 14, item 3)', () => {
  it('a NaN or negative warranty term, a NaN full-coverage period: not "0.00" or "NaN.NaN"', () => {
    expect(pathsOf(() => reserve.forecastReserve([{ ...cohort, termMonths: NaN }]))).toEqual([
      'cohorts.0.termMonths',
    ]);
    expect(pathsOf(() => reserve.forecastReserve([{ ...cohort, termMonths: -60 }]))).toEqual([
      'cohorts.0.termMonths',
    ]);
    expect(pathsOf(() => reserve.forecastReserve([{ ...cohort, fullCoverageMonths: NaN }]))).toEqual([
      'cohorts.0.fullCoverageMonths',
    ]);
    expect(pathsOf(() => reserve.expectedClaims(cohort.life, 10, 3, 12, NaN))).toEqual(['termMonths']);
  });

  it('a null life-data entry is an input error, not a TypeError', () => {
    const data = { failures: [3, null as unknown as number, 7] };
    expect(weibull.fitWeibull(data)).toMatchObject({
      ok: false,
      code: 'invalid_input',
      issues: [{ path: 'data.failures.1' }],
    });
    expect(pathsOf(() => kaplanMeier.kaplanMeier(data))).toEqual(['data.failures.1']);
    expect(pathsOf(() => weibull.plottingPositions(data))).toEqual(['data.failures.1']);
  });

  it('two failure times 5e-10 apart cannot be fitted (they gave a shape of 4.8e9)', () => {
    for (const method of ['mle', 'mrr'] as const) {
      expect(weibull.fitWeibull({ failures: [10, 10 + 5e-9], suspensions: [20] }, { method })).toMatchObject({
        ok: false,
        code: 'too_few_failures',
      });
      expect(weibull.fitWeibull({ failures: [1, 1 + 5e-10] }, { method })).toMatchObject({
        ok: false,
        code: 'too_few_failures',
      });
    }
  });

  it('Kaplan-Meier on NaN: an input error naming the entry, not a RangeError', () => {
    expect(pathsOf(() => kaplanMeier.kaplanMeier({ failures: [1, 2], suspensions: [NaN] }))).toEqual([
      'data.suspensions.0',
    ]);
  });

  // Every exported function, called with nonsense: each must refuse with AnalyticsInputError (fitWeibull with its
  // typed { ok: false } answer), never compute, throw a TypeError or a RangeError.
  const modules = {
    covered,
    failureModeRules,
    failureModes,
    gamma,
    kaplanMeier,
    lifeData,
    reserve,
    warrantyCost,
    weibull,
  };
  const functions = Object.entries(modules).flatMap(([m, exports]) =>
    Object.entries(exports)
      .filter(([, v]) => typeof v === 'function' && !/^[A-Z]/.test(v.name))
      .map(([name, fn]) => [`${m}.${name}`, fn as (...args: unknown[]) => unknown] as const),
  );

  it.each(functions)('%s refuses nonsense with a typed error', (name, fn) => {
    const nonsense = [NaN, null, { shape: NaN, scale: -1 }, 'x', NaN, NaN];
    let outcome: unknown;
    try {
      outcome = fn(...nonsense);
    } catch (e) {
      expect(e, name).toBeInstanceOf(AnalyticsInputError);
      expect((e as AnalyticsInputError).issues.length).toBeGreaterThan(0);
      return;
    }
    if (name === 'weibull.fitWeibull') {
      expect(outcome).toMatchObject({ ok: false, code: 'invalid_input' });
      return;
    }
    if (name === 'weibull.fitWeibullOrThrow') return;
    throw new Error(`${name} accepted nonsense and answered ${JSON.stringify(outcome)}`);
  });
});
