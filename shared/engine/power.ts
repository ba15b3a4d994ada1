// Electrical power arithmetic the engine and the forms share.

/** DC power, P = V x I (watts). */
export function dcPowerWatts(volts: number, amps: number): number {
  return volts * amps;
}

/** AC real power, P = V x I x PF (watts), with PF the power factor (0..1). */
export function acRealPowerWatts(volts: number, amps: number, powerFactor: number): number {
  return volts * amps * powerFactor;
}

/** Efficiency as a ratio, output / input; null when the input is not above zero (or too small to divide by). */
export function efficiencyRatio(outputWatts: number, inputWatts: number): number | null {
  const ratio = outputWatts / inputWatts;
  return inputWatts > 0 && Number.isFinite(ratio) ? ratio : null;
}

/** Rounds to `places` decimals for reporting (not for money: money stays in integer cents). */
export function roundTo(value: number, places: number): number {
  const f = places === 2 ? 100 : places === 3 ? 1000 : places === 4 ? 10000 : 10 ** places;
  const scaled = Math.round(value * f);
  // Past about 1e300 the scaling overflows; such a value has no decimals worth rounding.
  return Number.isFinite(scaled) ? scaled / f : value;
}
