import { describe, expect, it } from 'vitest';

import { logGamma, regularizedGamma } from '../../../shared/analytics/gamma';
import { AnalyticsInputError } from '../../../shared/analytics/validation';
import {
  expectedRebate,
  freeReplacementWarrantyCost,
  proRataWarrantyCost,
  rebateFraction,
} from '../../../shared/analytics/warranty-cost';

// The test's own Weibull density and numerical integration (composite Simpson's rule, 4,000 panels).
const f = (t: number, shape: number, scale: number) =>
  (shape / scale) * Math.pow(t / scale, shape - 1) * Math.exp(-Math.pow(t / scale, shape));
function simpson(g: (t: number) => number, a: number, b: number, n = 4000): number {
  const h = (b - a) / n;
  let sum = g(a) + g(b);
  for (let i = 1; i < n; i++) sum += (i % 2 === 1 ? 4 : 2) * g(a + i * h);
  return (sum * h) / 3;
}

describe('pro-rata warranty cost (Blischke & Murthy, linear pro-rata rebate)', () => {
  it('linear pro-rata over W: c integral_0^W (1 - t/W) f(t) dt, by numerical integration', () => {
    // shape 2.5, scale 80 months, W = 60 months, c = 120.00: the cost per unit sold.
    const byIntegration = 120 * simpson((t) => (1 - t / 60) * f(t, 2.5, 80), 0, 60);
    expect(proRataWarrantyCost({ shape: 2.5, scale: 80 }, { termMonths: 60 }, 120)).toBeCloseTo(
      byIntegration,
      8,
    );
    // A decreasing hazard (shape 0.7) puts most of the cost early, where the rebate is near full. Its density is
    // infinite at 0, so the test integrates over x = (t / scale)^shape instead: dF = e^-x dx, t = scale x^(1/shape),
    //   c integral_0^((36/200)^0.7) (1 - 200 x^(1/0.7) / 36) e^-x dx.
    const early =
      50 * simpson((x) => (1 - (200 * Math.pow(x, 1 / 0.7)) / 36) * Math.exp(-x), 0, Math.pow(36 / 200, 0.7));
    expect(proRataWarrantyCost({ shape: 0.7, scale: 200 }, { termMonths: 36 }, 50)).toBeCloseTo(early, 8);
  });

  it('the exponential closed form: c [1 - (1 - exp(-W/scale)) scale / W]', () => {
    // Blischke & Murthy's linear pro-rata cost for exponential lifetimes (shape 1), written out:
    //   c integral_0^W (1 - t/W) (1/s) e^(-t/s) dt = c [1 - s (1 - e^(-W/s)) / W].
    // W = 24, s = 100, c = 1: 1 - 100 (1 - e^-0.24) / 24 = 1 - 100 x 0.213372 / 24 = 0.110950
    const closed = 1 - (100 * (1 - Math.exp(-24 / 100))) / 24;
    expect(closed).toBeCloseTo(0.11095, 5);
    expect(proRataWarrantyCost({ shape: 1, scale: 100 }, { termMonths: 24 }, 1)).toBeCloseTo(closed, 12);
  });

  it('full cover to W1, then linear to 0 at W: the policy our reserve prorates by', () => {
    // shape 1.8, scale 90 months, W1 = 24, W = 60, c = 96:
    //   c [F(24) + integral_24^60 (60 - t)/36 f(t) dt], F(24) = 1 - exp(-(24/90)^1.8) written out, the rest by
    //   Simpson's rule (f is smooth on [24, 60]).
    const [shape, scale] = [1.8, 90];
    const byIntegration =
      96 *
      (1 - Math.exp(-Math.pow(24 / 90, 1.8)) + simpson((t) => ((60 - t) / 36) * f(t, shape, scale), 24, 60));
    expect(proRataWarrantyCost({ shape, scale }, { termMonths: 60, fullCoverageMonths: 24 }, 96)).toBeCloseTo(
      byIntegration,
      9,
    );
    // Cheaper than free replacement over the same term, c F(W) = 96 (1 - exp(-(60/90)^1.8)).
    const free = 96 * (1 - Math.exp(-Math.pow(60 / 90, 1.8)));
    expect(freeReplacementWarrantyCost({ shape, scale }, 60, 96)).toBeCloseTo(free, 12);
    expect(byIntegration).toBeLessThan(free);
  });

  it('one forecast month, given survival to today, by numerical integration', () => {
    // Units working at 40.5 months, failures in [45.5, 46.5): integral (60 - t)/36 f(t) dt / R(40.5).
    const [shape, scale] = [3, 70];
    const R = Math.exp(-Math.pow(40.5 / scale, shape));
    const byIntegration = simpson((t) => ((60 - t) / 36) * f(t, shape, scale), 45.5, 46.5) / R;
    expect(
      expectedRebate({ shape, scale }, 45.5, 46.5, 40.5, { termMonths: 60, fullCoverageMonths: 24 }),
    ).toBeCloseTo(byIntegration, 12);
    // The rebate at a given age, written out: (60 - 45.5) / 36 = 0.402 777...
    expect(rebateFraction(45.5, { termMonths: 60, fullCoverageMonths: 24 })).toBeCloseTo(14.5 / 36, 14);
    expect(rebateFraction(23.9, { termMonths: 60, fullCoverageMonths: 24 })).toBe(1);
    expect(rebateFraction(60, { termMonths: 60, fullCoverageMonths: 24 })).toBe(0);
  });

  it('refuses bad terms by name', () => {
    const bad = () => proRataWarrantyCost({ shape: 2, scale: 50 }, { termMonths: NaN }, 10);
    expect(bad).toThrow(AnalyticsInputError);
    try {
      bad();
    } catch (e) {
      expect((e as AnalyticsInputError).issues[0].path).toBe('terms.termMonths');
    }
    expect(() =>
      proRataWarrantyCost({ shape: 2, scale: 50 }, { termMonths: 12, fullCoverageMonths: 24 }, 1),
    ).toThrow(/full-coverage/);
  });
});

describe('incomplete gamma (closed forms for integer s)', () => {
  it('P(1, x) = 1 - e^-x and P(2, x) = 1 - e^-x (1 + x)', () => {
    for (const x of [0.01, 0.5, 1, 3, 7.5, 30]) {
      expect(regularizedGamma(1, x).p).toBeCloseTo(1 - Math.exp(-x), 13);
      expect(regularizedGamma(2, x).q).toBeCloseTo(Math.exp(-x) * (1 + x), 13);
    }
    // ln Gamma(5) = ln 24; ln Gamma(0.5) = ln sqrt(pi)
    expect(logGamma(5)).toBeCloseTo(Math.log(24), 13);
    expect(logGamma(0.5)).toBeCloseTo(0.5 * Math.log(Math.PI), 13);
  });
});
