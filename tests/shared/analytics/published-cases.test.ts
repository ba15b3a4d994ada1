import { describe, expect, it } from 'vitest';

import { kaplanMeier } from '../../../shared/analytics/kaplan-meier';
import { bLife, fitWeibull, type WeibullFit } from '../../../shared/analytics/weibull';

// Published and hand-checked censored cases. Every check names its source; where no published figure is at hand,
// the expected value is computed independently in the test (the likelihood written out and maximised here by a
// golden-section search, the score equations, the quantile's closed form, Greenwood's sum).

// Nelson (1982), Applied Life Data Analysis, p. 318: 70 diesel-generator fans, hours to fan failure or to the end
// of the study (0 = failed, 1 = still running), as reproduced in the SAS/QC PROC RELIABILITY documentation.
const FANS = `450 0 460 1 1150 0 1150 0 1560 1 1600 0 1660 1 1850 1 1850 1 1850 1 1850 1 1850 1 2030 1 2030 1
2030 1 2070 0 2070 0 2080 0 2200 1 3000 1 3000 1 3000 1 3000 1 3100 0 3200 1 3450 0 3750 1 3750 1 4150 1 4150 1
4150 1 4150 1 4300 1 4300 1 4300 1 4300 1 4600 0 4850 1 4850 1 4850 1 4850 1 5000 1 5000 1 5000 1 6100 1 6100 0
6100 1 6100 1 6300 1 6450 1 6450 1 6700 1 7450 1 7800 1 7800 1 8100 1 8100 1 8200 1 8500 1 8500 1 8500 1 8750 1
8750 0 8750 1 9400 1 9900 1 10100 1 10100 1 10100 1 11500 1`
  .split(/\s+/)
  .map(Number);
const fanFailures: number[] = [];
const fanSuspensions: number[] = [];
for (let i = 0; i < FANS.length; i += 2) (FANS[i + 1] === 0 ? fanFailures : fanSuspensions).push(FANS[i]);

/** The Weibull log-likelihood written out: sum_f ln f(t) + sum_s ln R(t). */
function logLikelihood(failures: number[], suspensions: number[], shape: number, scale: number): number {
  let ll = 0;
  for (const t of failures)
    ll += Math.log(shape / scale) + (shape - 1) * Math.log(t / scale) - Math.pow(t / scale, shape);
  for (const t of suspensions) ll -= Math.pow(t / scale, shape);
  return ll;
}

/**
 * The MLE found independently: for a shape b the best scale is (sum_all t^b / r)^(1/b); the profile likelihood
 * in b is maximised by golden-section search on [0.05, 20].
 */
function independentMle(failures: number[], suspensions: number[]) {
  const all = [...failures, ...suspensions];
  const scaleFor = (b: number) =>
    Math.pow(all.reduce((s, t) => s + Math.pow(t, b), 0) / failures.length, 1 / b);
  const profile = (b: number) => logLikelihood(failures, suspensions, b, scaleFor(b));
  let lo = 0.05;
  let hi = 20;
  const g = (Math.sqrt(5) - 1) / 2;
  for (let i = 0; i < 200; i++) {
    const x1 = hi - g * (hi - lo);
    const x2 = lo + g * (hi - lo);
    if (profile(x1) < profile(x2)) lo = x1;
    else hi = x2;
  }
  const shape = (lo + hi) / 2;
  return { shape, scale: scaleFor(shape), logLikelihood: profile(shape) };
}

function fitted(result: ReturnType<typeof fitWeibull>): WeibullFit {
  if (!result.ok) throw new Error(result.message);
  return result.fit;
}

describe('Nelson (1982) fan data: 70 fans, 12 failures, 58 still running', () => {
  const fit = fitted(fitWeibull({ failures: fanFailures, suspensions: fanSuspensions }));

  it('fits shape 1.0584 and scale 26,297 h', () => {
    expect(fanFailures).toHaveLength(12); // Nelson (1982), p. 318: 12 fan failures
    expect(fanSuspensions).toHaveLength(58); // Nelson (1982), p. 318: 58 fans still running
    // SAS/QC PROC RELIABILITY documentation, "Analysis of Right-Censored Data from a Single Population" (the
    // same data, in thousands of hours): Weibull shape 1.0584, scale 26.297 (from memory; confirmed below by
    // the independent maximisation and the score equations).
    expect(fit.shape).toBeCloseTo(1.0584, 4);
    expect(fit.scale / 1000).toBeCloseTo(26.297, 3);
    const mle = independentMle(fanFailures, fanSuspensions);
    expect(fit.shape).toBeCloseTo(mle.shape, 6);
    expect(fit.scale).toBeCloseTo(mle.scale, 1);
  });

  it('the score equations vanish at the fit', () => {
    // d lnL / d scale = 0 <=> sum_all (t/scale)^shape = r;
    // d lnL / d shape = 0 <=> r/shape + sum_f ln(t/scale) - sum_all (t/scale)^shape ln(t/scale) = 0.
    const { shape, scale } = fit;
    const all = [...fanFailures, ...fanSuspensions];
    const z = (t: number) => Math.pow(t / scale, shape);
    expect(all.reduce((s, t) => s + z(t), 0)).toBeCloseTo(12, 9);
    expect(
      12 / shape +
        fanFailures.reduce((s, t) => s + Math.log(t / scale), 0) -
        all.reduce((s, t) => s + z(t) * Math.log(t / scale), 0),
    ).toBeCloseTo(0, 9);
  });

  it('log-likelihood -135.153 (hours) at the fit, the likelihood written out', () => {
    const byHand = logLikelihood(fanFailures, fanSuspensions, fit.shape, fit.scale);
    expect(fit.logLikelihood).toBeCloseTo(byHand, 9);
    expect(byHand).toBeCloseTo(-135.1527, 3); // computed here from the formula above
    // In thousands of hours every failure's density is 1000 times larger: lnL rises by 12 ln 1000 = 82.893.
    expect(byHand + 12 * Math.log(1000)).toBeCloseTo(-52.2597, 3);
  });

  it('B1 = scale (-ln 0.99)^(1/shape) = 340.7 h, B10 = 3,137 h', () => {
    const b1 = fit.scale * Math.pow(-Math.log(0.99), 1 / fit.shape); // the Weibull quantile, closed form
    expect(bLife(fit, 1)).toBeCloseTo(b1, 9);
    expect(b1).toBeCloseTo(340.72, 1);
    expect(fit.b10).toBeCloseTo(fit.scale * Math.pow(-Math.log(0.9), 1 / fit.shape), 9);
  });
});

describe('a censored case with 8 suspensions', () => {
  // Invented for the test (no published fit at hand): 7 failures and 8 units still running, hours.
  const failures = [310, 720, 1050, 1490, 1980, 2600, 3700];
  const suspensions = [500, 900, 1200, 1800, 2500, 3000, 3000, 4000];

  it('matches the likelihood maximised independently, with its log-likelihood and B1', () => {
    const fit = fitted(fitWeibull({ failures, suspensions }));
    const mle = independentMle(failures, suspensions);
    expect(fit.units).toBe(15);
    expect(fit.shape).toBeCloseTo(mle.shape, 6);
    expect(fit.scale).toBeCloseTo(mle.scale, 2);
    expect(fit.logLikelihood).toBeCloseTo(mle.logLikelihood, 8);
    expect(bLife(fit, 1)).toBeCloseTo(mle.scale * Math.pow(-Math.log(0.99), 1 / mle.shape), 1);
  });
});

describe('Kaplan-Meier: Greenwood upper bound at the last failure', () => {
  // reliability (Python library) documentation, KaplanMeier example: 10 failures, 21 right-censored.
  const failures = [5248, 7454, 16890, 17200, 38700, 45000, 49390, 69040, 72280, 131900];
  const suspensions = [
    3961, 4007, 4734, 6054, 7298, 10190, 23060, 27160, 28690, 37100, 40060, 45670, 53000, 67000, 69630, 77350,
    78470, 91680, 105700, 106300, 150400,
  ];

  it('S(131900) = 0.269858 and its upper bound S + 1.959964 SE, Greenwood by hand', () => {
    // At each failure t_i: n_i = units with a time >= t_i (failures before censorings at a tie), d_i = 1;
    //   S = prod (1 - 1/n_i),  Var S = S^2 sum 1 / (n_i (n_i - 1)).
    const all = [...failures, ...suspensions];
    let S = 1;
    let sum = 0;
    for (const t of failures) {
      const n = all.filter((x) => x >= t).length;
      S *= 1 - 1 / n;
      sum += 1 / (n * (n - 1));
    }
    const upper = S + 1.959964 * S * Math.sqrt(sum);
    expect(S).toBeCloseTo(0.269858, 6); // reliability (Python library) documentation, KaplanMeier example
    const last = kaplanMeier({ failures, suspensions }).find((r) => r.time === 131900)!;
    expect(last.survival).toBeCloseTo(S, 12);
    expect(last.upper).toBeCloseTo(upper, 12);
    expect(upper).toBeCloseTo(0.662446, 6); // what the sums above give: 0.269858 + 1.959964 x 0.200304
  });
});
