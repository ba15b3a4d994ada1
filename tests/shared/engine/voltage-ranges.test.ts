import { describe, expect, it } from 'vitest';

import { classifyServiceVoltage, serviceVoltageRangesFor } from '../../../shared/engine/voltage-ranges';

describe('ANSI C84.1 service-voltage ranges', () => {
  // ANSI C84.1-2016, Table 1, "Standard nominal system voltages and voltage ranges", service voltage columns,
  // written out here as the standard prints them per system (not taken from the code's table):
  //   120/240 V single phase     Range A 114/228 - 126/252   Range B 110/220 - 127/254
  //   208Y/120 V three phase     Range A 197Y/114 - 218Y/126 Range B 191Y/110 - 220Y/127
  //   240 V three phase          Range A 228 - 252           Range B 220 - 254
  //   480Y/277 V three phase     Range A 456Y/263 - 504Y/291 Range B 440Y/254 - 508Y/293
  // Each nominal below takes its limits from the line of the system it belongs to; bounds inclusive.
  const table: [number, number, number, number, number][] = [
    [120, 114, 126, 110, 127], // ANSI C84.1 Table 1: 120/240 V (and 208Y/120 V line-to-neutral), Range A 114-126, Range B 110-127
    [208, 197, 218, 191, 220], // ANSI C84.1 Table 1: 208Y/120 V line-to-line, Range A 197-218, Range B 191-220
    [240, 228, 252, 220, 254], // ANSI C84.1 Table 1: 240 V, Range A 228-252, Range B 220-254
    [277, 263, 291, 254, 293], // ANSI C84.1 Table 1: 480Y/277 V line-to-neutral, Range A 263-291, Range B 254-293
    [480, 456, 504, 440, 508], // ANSI C84.1 Table 1: 480Y/277 V line-to-line, Range A 456-504, Range B 440-508
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
