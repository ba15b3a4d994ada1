// Lumen maintenance projection after IES TM-21 from IES LM-80-style data.
//
// Model: normalised flux Phi(t) = B exp(-alpha t), fitted as ln Phi = ln B - alpha t by least squares.
// Lp (hours to p % of initial flux) = ln(100 B / p) / alpha.
// Data window: tests of 6,000 to 10,000 h fit the last 5,000 h; longer tests fit the last half of the
// test; under 6,000 h is not enough data and gives no projection.
// Projection limit: 6x the test duration for 20 or more units, 5.5x for 10 to 19 units, the duration being that of
// the data set the projection uses (the shorter of the two when it interpolates between them). TM-21 gives no
// multiplier for fewer than 10 units; we then project no further than the test itself (1x), so any Lp
// beyond the tested hours is reported only as "> {test hours} h".
// Two case temperatures: Arrhenius interpolation, alpha_i = A exp(-Ea / (k T_i)) with T in kelvin, where
// Ea/k = ln(alpha1 / alpha2) / (1/T2 - 1/T1) and A = alpha1 exp(Ea / (k T1)); B_i = sqrt(B1 B2), the
// mid-point of ln B1 and ln B2 as TM-21 takes it.

export const IES_TM21 = 'IES TM-21';
export const MIN_TEST_HOURS = 6000;

export interface FluxPoint {
  hours: number;
  /** Flux as a fraction of initial (1 = initial). */
  flux: number;
}

export interface ExponentialFit {
  B: number;
  /** Decay rate per hour. */
  alpha: number;
}

export interface Lm80Fit extends ExponentialFit {
  testHours: number;
  windowStartHours: number;
  pointsUsed: number;
}

export interface LumenLife {
  p: number;
  /** Hours to p % of initial flux from the model; null when the model never gets there (alpha <= 0). */
  hours: number | null;
  /**
   * What TM-21 lets one state, in its own notation Lp(Dk), D the test duration in thousands of hours:
   * "L90(10k) = 47,655 h", or "L70(10k) > 60,000 h" when the model reaches past the projection limit.
   */
  reported: string;
  limited: boolean;
}

/** Least-squares fit of ln(flux) = ln(B) - alpha x hours over all the points given (at least two hours). */
export function fitExponential(points: readonly FluxPoint[]): ExponentialFit | null {
  const n = points.length;
  if (n < 2) return null;
  let sx = 0;
  let sy = 0;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < n; i++) {
    const x = points[i].hours;
    const y = Math.log(points[i].flux);
    sx += x;
    sy += y;
    sxx += x * x;
    sxy += x * y;
  }
  const denominator = n * sxx - sx * sx;
  if (!(denominator > 0)) return null;
  const slope = (n * sxy - sx * sy) / denominator;
  const intercept = (sy - slope * sx) / n;
  return { B: Math.exp(intercept), alpha: -slope };
}

/** First hour of the TM-21 fitting window for a test of this duration; null under 6,000 h. */
export function dataWindowStart(testHours: number): number | null {
  if (testHours < MIN_TEST_HOURS) return null;
  if (testHours <= 10000) return testHours - 5000;
  return testHours / 2;
}

/** Fits LM-80 data inside the TM-21 window. testHours defaults to the last point's hours. */
export function fitLm80(points: readonly FluxPoint[], testHours?: number): Lm80Fit | null {
  let duration = testHours ?? 0;
  if (testHours === undefined) for (const p of points) if (p.hours > duration) duration = p.hours;
  const start = dataWindowStart(duration);
  if (start === null) return null;
  const windowPoints = points.filter((p) => p.hours >= start && p.hours <= duration);
  const fit = fitExponential(windowPoints);
  if (fit === null) return null;
  return { ...fit, testHours: duration, windowStartHours: start, pointsUsed: windowPoints.length };
}

/** The multiplier on test duration TM-21 allows for a sample size (see the header for under 10 units). */
export function projectionMultiplier(sampleSize: number): number {
  if (sampleSize >= 20) return 6;
  if (sampleSize >= 10) return 5.5;
  return 1;
}

export function projectionLimitHours(testHours: number, sampleSize: number): number {
  return testHours * projectionMultiplier(sampleSize);
}

/** Hours to p % of initial flux; Infinity when alpha <= 0 and the model never falls to p. */
export function lumenLifeHours(fit: ExponentialFit, p: number): number {
  const ratio = (100 * fit.B) / p;
  if (ratio <= 1) return 0;
  if (fit.alpha <= 0) return Infinity;
  return Math.log(ratio) / fit.alpha;
}

/** Flux fraction the model gives at `hours`. */
export function projectedFlux(fit: ExponentialFit, hours: number): number {
  return fit.B * Math.exp(-fit.alpha * hours);
}

/** 60000 -> "60,000" (fixed grouping, whatever the locale). */
export function formatHours(hours: number): string {
  const s = String(Math.round(hours));
  let out = '';
  for (let i = 0; i < s.length; i++) {
    if (i > 0 && (s.length - i) % 3 === 0) out += ',';
    out += s[i];
  }
  return out;
}

/** TM-21's name for a lumen-maintenance life: L70(10k) for 70 % from a 10,000 h test (6,048 h -> "6.048k"). */
export function lumenLifeNotation(p: number, testHours: number): string {
  const thousands = String(Number((testHours / 1000).toFixed(3)));
  return `L${p}(${thousands}k)`;
}

export function reportLumenLife(
  fit: ExponentialFit,
  p: number,
  limitHours: number,
  testHours: number,
): LumenLife {
  const hours = lumenLifeHours(fit, p);
  const limited = hours > limitHours;
  const name = lumenLifeNotation(p, testHours);
  return {
    p,
    hours: Number.isFinite(hours) ? Math.round(hours) : null,
    reported: limited ? `${name} > ${formatHours(limitHours)} h` : `${name} = ${formatHours(hours)} h`,
    limited,
  };
}

export interface CaseTempFit extends ExponentialFit {
  caseTempC: number;
}

const KELVIN = 273.15;

/**
 * Arrhenius interpolation between two case temperatures (TM-21). Needs alpha > 0 at both temperatures
 * (null otherwise) and two different temperatures.
 */
export function arrheniusInterpolate(a: CaseTempFit, b: CaseTempFit, targetC: number): ExponentialFit | null {
  if (!(a.alpha > 0 && b.alpha > 0) || a.caseTempC === b.caseTempC) return null;
  const t1 = a.caseTempC + KELVIN;
  const t2 = b.caseTempC + KELVIN;
  const ti = targetC + KELVIN;
  const eaOverK = Math.log(a.alpha / b.alpha) / (1 / t2 - 1 / t1);
  const alpha = a.alpha * Math.exp(-eaOverK * (1 / ti - 1 / t1));
  return { B: Math.sqrt(a.B * b.B), alpha };
}
