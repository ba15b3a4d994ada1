import { AnalyticsInputError } from '../../../shared/analytics/validation';
import { describe, expect, it } from 'vitest';

import { installedLifeData } from '../../../shared/analytics/life-data';
import { fitWeibull } from '../../../shared/analytics/weibull';

describe('installed units as life data', () => {
  const installations = [
    {
      installedOn: '2023-01-15',
      quantity: 10,
      hoursPerDay: 12,
      failures: [{ failedOn: '2023-07-14' }, { failedOn: '2023-07-15', units: 2 }],
    },
    { installedOn: '2023-01-20', quantity: 5, hoursPerDay: 24, failures: [{ failedOn: '2024-01-20' }] },
    { installedOn: '2025-01-01', quantity: 7, hoursPerDay: 12 },
  ];

  it('ages in whole calendar months: failures at the failure date, the rest suspended at asOf', () => {
    const data = installedLifeData(installations, { asOf: '2024-03-31', unit: 'months' });
    expect(data.failures).toEqual([
      { time: 5, count: 1 },
      { time: 6, count: 2 },
      { time: 12, count: 1 },
    ]);
    expect(data.suspensions).toEqual([{ time: 14, count: 11 }]);
    expect(data).toMatchObject({
      unit: 'months',
      units: 15,
      failed: 4,
      notYetInstalled: 7,
      excessFailures: 0,
    });
  });

  it('ages in operating hours: days in service x hours a day', () => {
    const data = installedLifeData(installations, { asOf: '2024-01-15', unit: 'hours' });
    // 2023-01-15 -> 2023-07-14 is 180 days, -> 2023-07-15 181 days, -> 2024-01-15 365 days.
    expect(data.failures).toEqual([
      { time: 180 * 12, count: 1 },
      { time: 181 * 12, count: 2 },
    ]);
    // The failure of 2024-01-20 is after asOf: that unit was still working then.
    expect(data.suspensions).toEqual([
      { time: 365 * 12, count: 7 },
      { time: 360 * 24, count: 5 },
    ]);
  });

  it('midpoint ages put a first-month failure at half a month (a same-day one at half a day), so it can be fitted', () => {
    const early = [
      {
        installedOn: '2024-01-01',
        quantity: 3,
        failures: [{ failedOn: '2024-01-09' }, { failedOn: '2024-03-05' }],
      },
    ];
    const completed = installedLifeData(early, { asOf: '2024-06-01', unit: 'months' });
    expect(completed.failures[0]).toEqual({ time: 0, count: 1 });
    expect(fitWeibull(completed)).toMatchObject({ ok: false, code: 'invalid_time' });
    const midpoint = installedLifeData(early, { asOf: '2024-06-01', unit: 'months', age: 'midpoint' });
    expect(midpoint.failures).toEqual([
      { time: 0.5, count: 1 },
      { time: 2.5, count: 1 },
    ]);
    expect(midpoint.suspensions).toEqual([{ time: 5.5, count: 1 }]);
    expect(fitWeibull(midpoint).ok).toBe(true);
    const sameDay = [
      { installedOn: '2024-01-01', quantity: 2, hoursPerDay: 10, failures: [{ failedOn: '2024-01-01' }] },
    ];
    expect(installedLifeData(sameDay, { asOf: '2024-01-11', unit: 'hours', age: 'midpoint' })).toMatchObject({
      failures: [{ time: 5, count: 1 }],
      suspensions: [{ time: 105, count: 1 }],
    });
  });

  it('claims for more units than installed are left out and counted', () => {
    const data = installedLifeData(
      [{ installedOn: '2024-01-01', quantity: 2, failures: [{ failedOn: '2024-02-01', units: 3 }] }],
      { asOf: '2024-06-01', unit: 'months' },
    );
    expect(data).toMatchObject({ failed: 2, excessFailures: 1, suspensions: [] });
  });

  it('a million units in a thousand installations stay a handful of groups', () => {
    const many = Array.from({ length: 1000 }, (_, i) => ({
      installedOn: `20${20 + (i % 4)}-0${1 + (i % 9)}-15`,
      quantity: 1000,
      failures: [{ failedOn: '2024-05-01', units: i % 7 }],
    }));
    const data = installedLifeData(many, { asOf: '2024-06-30', unit: 'months' });
    expect(data.units).toBe(1_000_000);
    expect(data.suspensions.length + data.failures.length).toBeLessThan(100);
    expect(data.suspensions.reduce((s, g) => s + g.count, 0) + data.failed).toBe(1_000_000);
  });

  it('refuses malformed dates, quantities and a missing hoursPerDay for hours', () => {
    const asOf = '2024-01-01';
    expect(() =>
      installedLifeData([{ installedOn: '2023-13-01', quantity: 1 }], { asOf, unit: 'months' }),
    ).toThrow(/installations\.0\.installedOn/);
    expect(() =>
      installedLifeData([{ installedOn: '2023-01-01', quantity: 1.5 }], { asOf, unit: 'months' }),
    ).toThrow(/installations\.0\.quantity/);
    expect(() =>
      installedLifeData([{ installedOn: '2023-01-01', quantity: 1 }], { asOf, unit: 'hours' }),
    ).toThrow(AnalyticsInputError);
  });
});
