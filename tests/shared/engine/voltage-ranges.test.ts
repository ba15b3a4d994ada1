import { describe, expect, it } from 'vitest';

import { classifyServiceVoltage, serviceVoltageRangesFor } from '../../../shared/engine/voltage-ranges';

describe('ANSI C84.1 service-voltage ranges', () => {
  // ANSI C84.1 Table 1 (values from memory): nominal, Range A min/max, Range B min/max, bounds inclusive.
  const table: [number, number, number, number, number][] = [
    [120, 114, 126, 110, 127], // ANSI C84.1 Table 1 (values from memory)
    [208, 197, 218, 191, 220], // ANSI C84.1 Table 1 (values from memory)
    [240, 228, 252, 220, 254], // ANSI C84.1 Table 1 (values from memory)
    [277, 263, 291, 254, 293], // ANSI C84.1 Table 1 (values from memory)
    [480, 456, 504, 440, 508], // ANSI C84.1 Table 1 (values from memory)
  ];

  it.each(table)(
    '%i V: Range A %i-%i and Range B %i-%i, both bounds inclusive',
    (nominal, aMin, aMax, bMin, bMax) => {
      expect(serviceVoltageRangesFor(nominal)).toEqual({
        rangeA: { min: aMin, max: aMax },
        rangeB: { min: bMin, max: bMax },
      });
      expect(classifyServiceVoltage(nominal, aMin)).toBe('A');
      expect(classifyServiceVoltage(nominal, aMax)).toBe('A');
      expect(classifyServiceVoltage(nominal, nominal)).toBe('A');
      expect(classifyServiceVoltage(nominal, aMin - 0.5)).toBe('B');
      expect(classifyServiceVoltage(nominal, aMax + 0.5)).toBe('B');
      expect(classifyServiceVoltage(nominal, bMin)).toBe('B');
      expect(classifyServiceVoltage(nominal, bMax)).toBe('B');
      expect(classifyServiceVoltage(nominal, bMin - 0.1)).toBe('outside');
      expect(classifyServiceVoltage(nominal, bMax + 0.1)).toBe('outside');
    },
  );

  it('Range A is nominal +/- 5 % (rounded to whole volts)', () => {
    // ANSI C84.1 Table 1: Range A is +/- 5 % of nominal (well attested)
    for (const [nominal, aMin, aMax] of table) {
      expect(Math.abs(aMin - nominal * 0.95)).toBeLessThanOrEqual(0.6);
      expect(Math.abs(aMax - nominal * 1.05)).toBeLessThanOrEqual(0.6);
    }
  });

  it('347 V has no range on file, so a reading there is not graded', () => {
    // 347 V is not in our copy of ANSI C84.1 Table 1; documented as no range known
    expect(serviceVoltageRangesFor(347)).toBeNull();
    expect(classifyServiceVoltage(347, 347)).toBeNull();
  });
});
