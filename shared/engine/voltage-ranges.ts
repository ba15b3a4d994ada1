// Utility service-voltage ranges by nominal system voltage, from ANSI C84.1 Table 1 (values from memory;
// Range A is nominal +/- 5 %, which is well attested). Bounds are inclusive.
// 347 V (the Canadian 600Y/347 V lighting voltage) has no range here: ANSI C84.1 does not list it and we
// know no source for it, so a reading on a 347 V service gets no range (null) rather than a guess.

export type NominalSupplyVolts = 120 | 208 | 240 | 277 | 347 | 480;
export type ServiceVoltageRange = 'A' | 'B' | 'outside';

export interface VoltageRangeBounds {
  rangeA: { min: number; max: number };
  rangeB: { min: number; max: number };
}

export const SERVICE_VOLTAGE_RANGES: Readonly<Record<number, VoltageRangeBounds>> = {
  120: { rangeA: { min: 114, max: 126 }, rangeB: { min: 110, max: 127 } },
  208: { rangeA: { min: 197, max: 218 }, rangeB: { min: 191, max: 220 } },
  240: { rangeA: { min: 228, max: 252 }, rangeB: { min: 220, max: 254 } },
  277: { rangeA: { min: 263, max: 291 }, rangeB: { min: 254, max: 293 } },
  480: { rangeA: { min: 456, max: 504 }, rangeB: { min: 440, max: 508 } },
};

export const ANSI_C84_1 = 'ANSI C84.1, Table 1';

export function serviceVoltageRangesFor(nominal: number): VoltageRangeBounds | null {
  return SERVICE_VOLTAGE_RANGES[nominal] ?? null;
}

/** Which ANSI C84.1 range a service-voltage reading falls in; null when no range is known for the nominal. */
export function classifyServiceVoltage(nominal: number, volts: number): ServiceVoltageRange | null {
  const ranges = SERVICE_VOLTAGE_RANGES[nominal];
  if (ranges === undefined) return null;
  if (volts >= ranges.rangeA.min && volts <= ranges.rangeA.max) return 'A';
  if (volts >= ranges.rangeB.min && volts <= ranges.rangeB.max) return 'B';
  return 'outside';
}
