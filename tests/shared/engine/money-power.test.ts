import { describe, expect, it } from 'vitest';

import { formatCents, parseCents, scaleCentsHalfUp } from '../../../shared/engine/money';
import { acRealPowerWatts, dcPowerWatts, efficiencyRatio } from '../../../shared/engine/power';

describe('money in integer cents', () => {
  it('parses and formats decimal strings exactly', () => {
    expect(parseCents('96.00')).toBe(9600);
    expect(parseCents('96')).toBe(9600);
    expect(parseCents('96.5')).toBe(9650);
    expect(parseCents('0.07')).toBe(7);
    expect(parseCents('1000000.00')).toBe(100000000);
    expect(formatCents(9650)).toBe('96.50');
    expect(formatCents(7)).toBe('0.07');
    expect(formatCents(0)).toBe('0.00');
  });

  it('rounds half up to the cent without float drift', () => {
    expect(scaleCentsHalfUp(1, 1, 2)).toBe(1); // 0.5 cent -> 1
    expect(scaleCentsHalfUp(1, 1, 3)).toBe(0); // 0.333 cent -> 0
    expect(scaleCentsHalfUp(9600, 20, 24)).toBe(8000);
    expect(scaleCentsHalfUp(1001, 1, 2)).toBe(501); // 500.5 -> 501
    // 0.1 + 0.2 style drift: 33.35 x 1/2 = 16.675 -> 16.68 (a float product would give 16.67)
    expect(scaleCentsHalfUp(3335, 1, 2)).toBe(1668);
  });
});

describe('power', () => {
  it('DC power is volts times amps', () => {
    // physics: P = V x I
    expect(dcPowerWatts(44.2, 0.44)).toBeCloseTo(19.448, 9);
  });

  it('AC real power is volts times amps times power factor', () => {
    // physics: P = V x I x PF
    expect(acRealPowerWatts(120, 0.2, 0.95)).toBeCloseTo(22.8, 9);
    expect(acRealPowerWatts(277, 1, 1)).toBe(277);
  });

  it('efficiency is output over input', () => {
    // physics: efficiency = output / input
    expect(efficiencyRatio(19.448, 24)).toBeCloseTo(0.8103, 4);
    expect(efficiencyRatio(10, 0)).toBeNull();
  });
});
