import { describe, expect, it } from 'vitest';

import { daysBetween, daysFromCivil, daysInMonth, wholeMonthsBetween } from '../../../shared/engine/dates';

describe('calendar arithmetic', () => {
  it('counts days like the Gregorian calendar', () => {
    // Gregorian calendar: 1970-01-01 is day 0; 2000 is a leap year, 1900 and 2100 are not
    expect(daysFromCivil(1970, 1, 1)).toBe(0);
    expect(daysFromCivil(2000, 3, 1) - daysFromCivil(2000, 2, 28)).toBe(2);
    expect(daysFromCivil(2100, 3, 1) - daysFromCivil(2100, 2, 28)).toBe(1);
    expect(daysInMonth(2024, 2)).toBe(29);
    expect(daysInMonth(2025, 2)).toBe(28);
    expect(daysInMonth(1900, 2)).toBe(28);
    expect(daysBetween('2024-01-15', '2025-06-10')).toBe(512);
    expect(daysBetween('2024-01-01', '2025-01-01')).toBe(366);
  });

  it('counts whole calendar months completed', () => {
    expect(wholeMonthsBetween('2024-01-15', '2025-06-10')).toBe(16);
    expect(wholeMonthsBetween('2024-01-15', '2025-06-15')).toBe(17);
    expect(wholeMonthsBetween('2024-01-15', '2024-01-15')).toBe(0);
    expect(wholeMonthsBetween('2024-01-15', '2024-02-14')).toBe(0);
    expect(wholeMonthsBetween('2024-12-31', '2025-01-31')).toBe(1);
  });

  it('moves an anniversary on a missing day to the month end (Jan 31 -> Feb 28)', () => {
    expect(wholeMonthsBetween('2025-01-31', '2025-02-28')).toBe(1);
    expect(wholeMonthsBetween('2025-01-31', '2025-02-27')).toBe(0);
    expect(wholeMonthsBetween('2024-01-31', '2024-02-28')).toBe(0); // leap year: the anniversary is Feb 29
    expect(wholeMonthsBetween('2024-01-31', '2024-02-29')).toBe(1);
    expect(wholeMonthsBetween('2025-01-30', '2025-02-28')).toBe(1);
    expect(wholeMonthsBetween('2025-03-31', '2025-04-30')).toBe(1);
    expect(wholeMonthsBetween('2025-01-31', '2025-03-30')).toBe(1);
    expect(wholeMonthsBetween('2025-01-31', '2025-03-31')).toBe(2);
    expect(wholeMonthsBetween('2025-02-28', '2025-03-27')).toBe(0);
    expect(wholeMonthsBetween('2025-02-28', '2025-03-28')).toBe(1);
    expect(wholeMonthsBetween('2024-02-29', '2025-02-28')).toBe(12);
  });

  it('never answers a negative age', () => {
    expect(wholeMonthsBetween('2025-06-10', '2025-01-10')).toBe(0);
  });
});
