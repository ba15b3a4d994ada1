// Electrical power arithmetic the engine and the forms share.

/** DC power, P = V x I (watts). */
export function dcPowerWatts(volts: number, amps: number): number {
  return volts * amps;
}

/** AC real power, P = V x I x PF (watts), with PF the power factor (0..1). */
export function acRealPowerWatts(volts: number, amps: number, powerFactor: number): number {
  return volts * amps * powerFactor;
}

/** Efficiency as a ratio, output / input; null when the input is not above zero. */
export function efficiencyRatio(outputWatts: number, inputWatts: number): number | null {
  return inputWatts > 0 ? outputWatts / inputWatts : null;
}

/** Rounds to `places` decimals for reporting (not for money: money stays in integer cents). */
export function roundTo(value: number, places: number): number {
  const f = places === 2 ? 100 : places === 3 ? 1000 : places === 4 ? 10000 : 10 ** places;
  return Math.round(value * f) / f;
}
