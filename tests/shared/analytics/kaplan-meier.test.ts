import { AnalyticsInputError } from '../../../shared/analytics/validation';
import { describe, expect, it } from 'vitest';

import { kaplanMeier, survivalAt } from '../../../shared/analytics/kaplan-meier';

const EXAMPLE = {
  failures: [5248, 7454, 16890, 17200, 38700, 45000, 49390, 69040, 72280, 131900],
  suspensions: [
    3961, 4007, 4734, 6054, 7298, 10190, 23060, 27160, 28690, 37100, 40060, 45670, 53000, 67000, 69630, 77350,
    78470, 91680, 105700, 106300, 150400,
  ],
};

describe('Kaplan-Meier', () => {
  const rows = kaplanMeier(EXAMPLE);
  const at = (time: number) => rows.find((r) => r.time === time)!;

  it('S = 0.964286 at 5248, 0.845217 at 17200 (band 0.705334-0.985101), 0.269858 at 131900', () => {
    expect(at(5248).survival).toBeCloseTo(0.964286, 6); // reliability (Python library) documentation, KaplanMeier example
    expect(at(17200).survival).toBeCloseTo(0.845217, 6); // reliability (Python library) documentation, KaplanMeier example
    expect(at(17200).lower).toBeCloseTo(0.705334, 6); // reliability (Python library) documentation, KaplanMeier example
    expect(at(17200).upper).toBeCloseTo(0.985101, 6); // reliability (Python library) documentation, KaplanMeier example
    expect(at(131900).survival).toBeCloseTo(0.269858, 6); // reliability (Python library) documentation, KaplanMeier example
  });

  it('counts who is at risk, and clips the band to [0, 1]', () => {
    expect(rows).toHaveLength(31);
    expect(rows[0]).toMatchObject({
      time: 3961,
      atRisk: 31,
      failed: 0,
      censored: 1,
      survival: 1,
      lower: 1,
      upper: 1,
    });
    expect(at(5248)).toMatchObject({ atRisk: 28, failed: 1, upper: 1 });
    expect(at(131900).lower).toBe(0);
  });

  it('survivalAt steps: 1 before the first failure, the last value at or before t', () => {
    expect(survivalAt(rows, 100)).toBe(1);
    expect(survivalAt(rows, 5248)).toBe(at(5248).survival);
    expect(survivalAt(rows, 17199)).toBe(at(16890).survival);
    expect(survivalAt(rows, 1e9)).toBe(at(131900).survival);
  });

  it('grouped counts give the same table as the units one by one; failures come before censorings at a tie', () => {
    const grouped = kaplanMeier({
      failures: [{ time: 10, count: 2 }, 20],
      suspensions: [{ time: 10, count: 3 }, 30],
    });
    const single = kaplanMeier({ failures: [10, 10, 20], suspensions: [10, 10, 10, 30] });
    expect(grouped).toEqual(single);
    expect(grouped[0]).toMatchObject({ time: 10, atRisk: 7, failed: 2, censored: 3 });
    expect(grouped[0].survival).toBeCloseTo(5 / 7, 15); // computed from the product-limit formula
    expect(grouped[1].survival).toBeCloseTo((5 / 7) * (1 / 2), 15); // computed from the product-limit formula
  });

  it('when the last unit at risk fails, S is 0 with no error band', () => {
    const table = kaplanMeier({ failures: [1, 2, 3] });
    expect(table[2]).toMatchObject({ survival: 0, standardError: 0, lower: 0, upper: 0 });
  });

  it('refuses negative or infinite times', () => {
    expect(() => kaplanMeier({ failures: [-1] })).toThrow(AnalyticsInputError);
    expect(() => kaplanMeier({ failures: [NaN] })).toThrow(/data\.failures\.0/);
  });
});
