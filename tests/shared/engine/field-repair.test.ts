import { describe, expect, it } from 'vitest';

import { evaluateClaim } from '../../../shared/engine';
import { dcPowerWatts, efficiencyRatio } from '../../../shared/engine/power';
import { makeInput } from './factory';

// Check values from a field repair of a 24 W-rated high-output LED lamp: 12 parallel strings of 16 LEDs
// on a 0.44 A constant-current driver.

describe('trade practice from a field repair', () => {
  it('counts 192 LEDs in 12 strings of 16', () => {
    const e = evaluateClaim(makeInput({ claim: { measurements: { strings: [] } } }));
    expect(e.computed.totalLeds).toBe(192); // common practice, no published source
  });

  it('shares a 0.44 A driver at about 36-37 mA a string', () => {
    const share = (0.44 / 12) * 1000;
    expect(share).toBeGreaterThanOrEqual(36); // common practice, no published source
    expect(share).toBeLessThanOrEqual(37); // common practice, no published source
    const e = evaluateClaim(makeInput({ claim: { measurements: { strings: [{ amps: 0.0367 }] } } }));
    expect(e.computed.currentShareByString[0]).toBeCloseTo(1.0, 2); // common practice, no published source
  });

  it('reads 44.2 V at 0.44 A as about 19.4 W out, about 4-5 W lost in the driver of a 24 W input, near 81 %', () => {
    const out = dcPowerWatts(44.2, 0.44);
    expect(out).toBeCloseTo(19.4, 1); // common practice, no published source ("about 20 W")
    expect(24 - out).toBeGreaterThanOrEqual(4); // common practice, no published source
    expect(24 - out).toBeLessThanOrEqual(5); // common practice, no published source
    expect(efficiencyRatio(out, 24)).toBeCloseTo(0.81, 2); // common practice, no published source
    const e = evaluateClaim(
      makeInput({
        claim: { measurements: { inputWatts: 24, driverOutputVolts: 44.2, driverOutputAmps: 0.44 } },
      }),
    );
    expect(e.computed.driverOutputWatts).toBe(19.448);
    expect(e.computed.driverEfficiency).toBe(0.8103);
    expect(e.findings.find((f) => f.code === 'electrical.driver_efficiency')?.severity).toBe('pass');
  });

  it('expects 16 white LEDs of about 2.9-3 V in series to need about 47-48 V', () => {
    const at29 = evaluateClaim(makeInput({ product: { ledForwardVolts: 2.9 } })).computed.expectedStringVolts;
    const at30 = evaluateClaim(makeInput({ product: { ledForwardVolts: 3.0 } })).computed.expectedStringVolts;
    expect(at29).toBeCloseTo(46.4, 6); // common practice, no published source (about 47 V)
    expect(at30).toBe(48); // common practice, no published source
  });

  it('flags a string whose dead LEDs were bridged: it carries more than its share', () => {
    const e = evaluateClaim(
      makeInput({ claim: { measurements: { strings: [{ amps: 0.037 }, { amps: 0.055, volts: 42 }] } } }),
    );
    const f = e.findings.find((x) => x.code === 'electrical.string_overcurrent');
    expect(f).toBeDefined(); // common practice, no published source
    expect(f!.values.strings).toBe('2');
    expect(e.computed.shortedLedsByString).toEqual([null, 2]); // (48 - 42) / 3 = 2 bridged LEDs
  });

  it('flags a driver pushed to its voltage limit (about 54 V) by an open LED, where the lamp cycles', () => {
    const e = evaluateClaim(
      makeInput({
        claim: {
          symptoms: ['cycling'],
          measurements: { driverOutputVolts: 54, driverOutputAmps: 0.02, inputWatts: 3 },
        },
      }),
    );
    expect(e.findings.map((f) => f.code)).toContain('electrical.driver_at_voltage_limit'); // common practice, no published source
    expect(e.findings.find((f) => f.code === 'coverage.failure_qualifies')).toBeDefined(); // cycling qualifies (ENGINE.md)
  });

  it('notes a partly failed LED dropping about 10 V on its string', () => {
    const e = evaluateClaim(
      makeInput({ claim: { measurements: { strings: [{ volts: 48 + 10 - 3, amps: 0.03 }] } } }),
    );
    expect(e.findings.map((f) => f.code)).toContain('electrical.string_voltage_high'); // common practice, no published source
  });
});
