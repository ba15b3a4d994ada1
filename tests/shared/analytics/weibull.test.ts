import { AnalyticsInputError } from '../../../shared/analytics/validation';
import { describe, expect, it } from 'vitest';

import { gamma } from '../../../shared/analytics/gamma';
import {
  bLife,
  fitWeibull,
  fitWeibullOrThrow,
  plottingPositions,
  probabilityPlot,
  WeibullDataError,
  weibullCdf,
  weibullMean,
  weibullPdf,
  weibullQuantile,
  weibullReliability,
  type WeibullFit,
} from '../../../shared/analytics/weibull';

const FIT_WEIBULL_2P_EXAMPLE = [
  58, 75, 36, 52, 63, 65, 22, 17, 28, 64, 23, 40, 73, 45, 52, 36, 52, 60, 13, 55, 82, 55, 34, 57, 23, 42, 66,
  35, 34, 25,
];
const LEAST_SQUARES_EXAMPLE = [25, 43, 53, 65, 76, 86, 95, 115, 132, 150];
const BEARING_CAGE = {
  failures: [230, 334, 423, 990, 1009, 1510],
  suspensions: [
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
  ].map(([count, time]) => ({ time, count })),
};

function fitted(result: ReturnType<typeof fitWeibull>): WeibullFit {
  if (!result.ok) throw new Error(result.message);
  return result.fit;
}

describe('Weibull maximum likelihood', () => {
  it('complete data: scale 51.858, shape 2.80086', () => {
    const fit = fitted(fitWeibull({ failures: FIT_WEIBULL_2P_EXAMPLE }));
    expect(fit.method).toBe('mle');
    expect(fit.scale).toBeCloseTo(51.858, 3); // reliability (Python library) documentation, Fit_Weibull_2P example
    expect(fit.shape).toBeCloseTo(2.80086, 5); // reliability (Python library) documentation, Fit_Weibull_2P example
    expect(fit.failures).toBe(30);
    expect(fit.units).toBe(30);
  });

  it('bearing-cage data, 6 failures among 1,703 units: shape 2.035, scale 11792, B10 3903 h', () => {
    const fit = fitted(fitWeibull(BEARING_CAGE));
    expect(fit.units).toBe(1703);
    expect(fit.failures).toBe(6);
    expect(fit.shape).toBeCloseTo(2.035, 3); // Meeker & Escobar (1998), Table C.5, bearing-cage data
    expect(Math.round(fit.scale)).toBe(11792); // Meeker & Escobar (1998), Table C.5, bearing-cage data
    expect(Math.round(fit.b10)).toBe(3903); // Meeker & Escobar (1998), Table C.5, bearing-cage data
  });

  it('grouped and ungrouped data give the same fit', () => {
    const expanded = BEARING_CAGE.suspensions.flatMap(({ time, count }) =>
      new Array<number>(count).fill(time),
    );
    const a = fitted(fitWeibull(BEARING_CAGE));
    const b = fitted(fitWeibull({ failures: BEARING_CAGE.failures, suspensions: expanded }));
    expect(b.shape).toBeCloseTo(a.shape, 10);
    expect(b.scale).toBeCloseTo(a.scale, 6);
  });

  it('the likelihood is highest at the fit', () => {
    const best = fitted(fitWeibull(BEARING_CAGE));
    for (const factor of [0.98, 1.02]) {
      // The scale that goes with a shape is the closed form; moving the shape off the fit lowers the likelihood.
      const shape = best.shape * factor;
      let sumPow = 0;
      for (const t of BEARING_CAGE.failures) sumPow += Math.pow(t, shape);
      for (const { time, count } of BEARING_CAGE.suspensions) sumPow += count * Math.pow(time, shape);
      const scale = Math.pow(sumPow / 6, 1 / shape);
      let ll = 0;
      for (const t of BEARING_CAGE.failures) ll += Math.log(weibullPdf({ shape, scale }, t));
      for (const { time, count } of BEARING_CAGE.suspensions)
        ll += count * Math.log(weibullReliability({ shape, scale }, time));
      expect(ll).toBeLessThan(best.logLikelihood);
    }
  });
});

describe('Weibull median-rank regression', () => {
  it('least squares, Y on X, complete data: scale 96.37348533880761, shape 2.02739072618974', () => {
    const fit = fitted(fitWeibull({ failures: LEAST_SQUARES_EXAMPLE }, { method: 'mrr' }));
    expect(fit.scale).toBeCloseTo(96.37348533880761, 9); // reliability (Python library) documentation, least-squares example
    expect(fit.shape).toBeCloseTo(2.02739072618974, 11); // reliability (Python library) documentation, least-squares example
  });

  it("plotting positions with suspensions (Johnson's adjusted ranks, Bernard's approximation)", () => {
    const F = plottingPositions({
      failures: [150, 560, 800, 1720, 5230, 6890],
      suspensions: [340, 1130, 2470, 4210],
    }).map((p) => p.F);
    const published = [0.06730769, 0.1741453, 0.28098291, 0.40562678, 0.61336657, 0.82110636];
    expect(F).toHaveLength(6);
    // reliability (Python library) documentation, least-squares example (plotting positions with suspensions)
    F.forEach((value, i) => expect(value).toBeCloseTo(published[i], 7));
  });

  it('complete data: plain Bernard (i - 0.3) / (n + 0.4)', () => {
    const positions = plottingPositions({ failures: [30, 10, 20] });
    expect(positions.map((p) => p.time)).toEqual([10, 20, 30]);
    expect(positions.map((p) => p.F)).toEqual([0.7 / 3.4, 1.7 / 3.4, 2.7 / 3.4]); // computed from Bernard's approximation
  });

  it('a group of tied failures counts as that many units', () => {
    const grouped = fitted(fitWeibull({ failures: [{ time: 10, count: 3 }, 20, 40] }, { method: 'mrr' }));
    const single = fitted(fitWeibull({ failures: [10, 10, 10, 20, 40] }, { method: 'mrr' }));
    expect(grouped.shape).toBeCloseTo(single.shape, 12);
    expect(grouped.scale).toBeCloseTo(single.scale, 10);
    const positions = plottingPositions({ failures: [{ time: 10, count: 3 }, 20, 40] });
    expect(positions[0]).toEqual({ time: 10, count: 3, rank: 3, F: 2.7 / 5.4 });
  });
});

describe('the distribution', () => {
  const p = { shape: 2, scale: 1000 };

  it('shape 2, scale 1000: B10 324.5928, B50 832.5546, mean 886.2269', () => {
    expect(bLife(p, 10)).toBeCloseTo(324.5928, 4); // computed from the Weibull quantile and mean
    expect(bLife(p, 50)).toBeCloseTo(832.5546, 4); // computed from the Weibull quantile and mean
    expect(weibullMean(p)).toBeCloseTo(886.2269, 4); // computed from the Weibull quantile and mean
  });

  it('the quantile inverts the cdf; R = 1 - F; the pdf integrates to the cdf', () => {
    for (const q of [0.001, 0.1, 0.5, 0.9, 0.999])
      expect(weibullCdf(p, weibullQuantile(p, q))).toBeCloseTo(q, 12);
    expect(weibullReliability(p, 700) + weibullCdf(p, 700)).toBeCloseTo(1, 15);
    let integral = 0;
    const steps = 20000;
    for (let i = 0; i < steps; i++) integral += weibullPdf(p, ((i + 0.5) * 1500) / steps) * (1500 / steps);
    expect(integral).toBeCloseTo(weibullCdf(p, 1500), 8);
    expect(() => weibullQuantile(p, 1)).toThrow(AnalyticsInputError);
  });

  it('Lanczos gamma: Gamma(5) = 24, Gamma(1/2) = sqrt(pi), Gamma(1.5) = sqrt(pi)/2', () => {
    expect(gamma(5)).toBeCloseTo(24, 12); // computed: Gamma(n) = (n - 1)!
    expect(gamma(0.5)).toBeCloseTo(Math.sqrt(Math.PI), 13); // computed: Gamma(1/2) = sqrt(pi)
    expect(gamma(1.5)).toBeCloseTo(Math.sqrt(Math.PI) / 2, 13); // computed: Gamma(3/2) = sqrt(pi) / 2
    expect(gamma(0.25)).toBeCloseTo(3.625609908221908, 12); // Gamma(1/4) = 3.6256099082..., the standard tabulated constant
  });
});

describe('validation', () => {
  it('fewer than two distinct failure times is a typed failure, not an exception', () => {
    expect(fitWeibull({ failures: [] })).toMatchObject({ ok: false, code: 'too_few_failures' });
    expect(fitWeibull({ failures: [{ time: 5, count: 40 }], suspensions: [10, 20] })).toMatchObject({
      ok: false,
      code: 'too_few_failures',
    });
    expect(fitWeibull({ failures: [5, 5, 5] }, { method: 'mrr' })).toMatchObject({
      ok: false,
      code: 'too_few_failures',
    });
  });

  it('a failure at time 0, a negative or infinite time, a negative count: typed failures', () => {
    expect(fitWeibull({ failures: [0, 3, 4] })).toMatchObject({ ok: false, code: 'invalid_time' });
    // Refused by the input schema, naming the entry.
    expect(fitWeibull({ failures: [2, 3], suspensions: [-1] })).toMatchObject({
      ok: false,
      code: 'invalid_input',
      issues: [{ path: 'data.suspensions.0' }],
    });
    expect(fitWeibull({ failures: [2, Infinity] })).toMatchObject({
      ok: false,
      code: 'invalid_input',
      issues: [{ path: 'data.failures.1' }],
    });
    expect(fitWeibull({ failures: [2, { time: 3, count: -1 }] })).toMatchObject({
      ok: false,
      code: 'invalid_input',
      issues: [{ path: 'data.failures.1.count' }],
    });
  });

  it('a suspension at time 0 is allowed and changes nothing in the likelihood', () => {
    const a = fitted(fitWeibull({ failures: [3, 8, 9], suspensions: [0, 0, 10] }));
    const b = fitted(fitWeibull({ failures: [3, 8, 9], suspensions: [10] }));
    expect(a.shape).toBe(b.shape);
    expect(a.units).toBe(6);
  });

  it('fitWeibullOrThrow throws a WeibullDataError with the code', () => {
    expect(() => fitWeibullOrThrow({ failures: [7] })).toThrow(WeibullDataError);
    expect(() => fitWeibullOrThrow({ failures: [7] })).toThrow(/two or more distinct times/);
    expect(fitWeibullOrThrow({ failures: [7, 9] }).shape).toBeGreaterThan(0);
  });
});

describe('the probability plot', () => {
  it('plots the failures at their positions and the fitted line between the first and last failure', () => {
    const data = { failures: [150, 560, 800, 1720, 5230, 6890], suspensions: [340, 1130, 2470, 4210] };
    const fit = fitted(fitWeibull(data));
    const plot = probabilityPlot(data, fit);
    expect(plot.points).toHaveLength(6);
    expect(plot.points[0]).toMatchObject({ time: 150, count: 1, x: Math.log(150) });
    expect(plot.points[0].y).toBeCloseTo(Math.log(-Math.log(1 - 0.0673076923)), 8);
    const [start, end] = plot.line;
    expect(start.time).toBe(150);
    expect(end.time).toBe(6890);
    // On Weibull paper the fitted line has slope = shape.
    expect((end.y - start.y) / (end.x - start.x)).toBeCloseTo(fit.shape, 10);
    expect(end.F).toBeCloseTo(weibullCdf(fit, 6890), 15);
  });
});
