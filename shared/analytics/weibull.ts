// Two-parameter Weibull life model fitted to right-censored life data: failures, and suspensions (units
// still working, or taken out of service unfailed, at the age given). Each time may carry a count, so an
// installed base of a million units grouped by age costs a few hundred terms, not a million.
//
// F(t) = 1 - exp(-(t / scale)^shape). Two fits:
// - 'mle' (the default; field data are mostly survivors): the profile likelihood equation for the shape,
//     g(b) = sum_all w t^b ln t / sum_all w t^b - 1/b - (1/r) sum_failures w ln t = 0,
//   is increasing in b, so it is solved by Newton's method kept inside a bracket (bisection whenever a Newton
//   step would leave it); then scale = (sum_all w t^b / r)^(1/b), r the number of failures.
// - 'mrr': median-rank regression, Y = ln(-ln(1 - F)) on X = ln t by least squares, F from Bernard's
//   approximation (i - 0.3) / (n + 0.4), with Johnson's adjusted ranks in place of i when there are suspensions.

import { z } from 'zod';

import { gamma } from './gamma';
import {
  AnalyticsInputError,
  check,
  finite,
  issuesOf,
  checkLifeData,
  lifeDataIssues,
  weibullParametersSchema,
  type AnalyticsIssue,
} from './validation';

/**
 * Failure times whose logarithms span no more than this (a relative difference of one part in a million) are
 * one time as far as a fit can tell: two failures 5e-10 apart would otherwise give a shape of about 1e9.
 * Common practice, no published source: recorded ages carry a few significant digits at most.
 */
const DISTINCT_LOG_SPAN = 1e-6;

/** A time (any positive unit: months, hours) and how many units share it. */
export interface LifeGroup {
  time: number;
  count: number;
}

/** A bare number is one unit at that time. */
export type LifeTimes = readonly (number | LifeGroup)[];

export interface LifeData {
  failures: LifeTimes;
  /** Right-censored: units known to have survived to this time. */
  suspensions?: LifeTimes;
}

export interface WeibullParameters {
  shape: number;
  scale: number;
}

export type WeibullMethod = 'mle' | 'mrr';

export interface WeibullFit extends WeibullParameters {
  method: WeibullMethod;
  /** Units that failed, and units in all (failures + suspensions). */
  failures: number;
  units: number;
  b10: number;
  b50: number;
  meanLife: number;
  logLikelihood: number;
}

export type WeibullFitErrorCode = 'invalid_input' | 'invalid_time' | 'invalid_count' | 'too_few_failures';

export type WeibullFitResult =
  | { ok: true; fit: WeibullFit }
  | { ok: false; code: WeibullFitErrorCode; message: string; issues?: AnalyticsIssue[] };

export class WeibullDataError extends Error {
  constructor(
    readonly code: WeibullFitErrorCode,
    message: string,
  ) {
    super(message);
    this.name = 'WeibullDataError';
  }
}

// ---- the distribution ----
// The exported functions check their arguments; the module's own loops use the unchecked forms below.

const timeSchema = finite('a time');
const distributionArgs = z.tuple([weibullParametersSchema, timeSchema]);

function cumulativeHazardOf(p: WeibullParameters, t: number): number {
  return t <= 0 ? 0 : Math.pow(t / p.scale, p.shape);
}

function cdfOf(p: WeibullParameters, t: number): number {
  return -Math.expm1(-cumulativeHazardOf(p, t));
}

function quantileOf(p: WeibullParameters, q: number): number {
  return p.scale * Math.pow(-Math.log1p(-q), 1 / p.shape);
}

function meanOf(p: WeibullParameters): number {
  return p.scale * gamma(1 + 1 / p.shape);
}

/** Cumulative hazard (t / scale)^shape; 0 for t <= 0. */
export function weibullCumulativeHazard(p: WeibullParameters, t: number): number {
  check('weibullCumulativeHazard', distributionArgs, [p, t], ['p', 't']);
  return cumulativeHazardOf(p, t);
}

export function weibullCdf(p: WeibullParameters, t: number): number {
  check('weibullCdf', distributionArgs, [p, t], ['p', 't']);
  return cdfOf(p, t);
}

export function weibullReliability(p: WeibullParameters, t: number): number {
  check('weibullReliability', distributionArgs, [p, t], ['p', 't']);
  return Math.exp(-cumulativeHazardOf(p, t));
}

export function weibullPdf(p: WeibullParameters, t: number): number {
  check('weibullPdf', distributionArgs, [p, t], ['p', 't']);
  if (t < 0) return 0;
  if (t === 0) return p.shape < 1 ? Infinity : p.shape === 1 ? 1 / p.scale : 0;
  const z = t / p.scale;
  return (p.shape / p.scale) * Math.pow(z, p.shape - 1) * Math.exp(-Math.pow(z, p.shape));
}

const quantileArgs = z.tuple([
  weibullParametersSchema,
  finite('a fraction').refine((q) => q >= 0 && q < 1, 'A quantile needs 0 <= q < 1.'),
]);

/** The time by which a fraction q (0 <= q < 1) of units has failed: scale (-ln(1 - q))^(1/shape). */
export function weibullQuantile(p: WeibullParameters, q: number): number {
  check('weibullQuantile', quantileArgs, [p, q], ['p', 'q']);
  return quantileOf(p, q);
}

const bLifeArgs = z.tuple([
  weibullParametersSchema,
  finite('a percentage').refine((q) => q >= 0 && q < 100, 'A B-life needs 0 <= percent < 100.'),
]);

/** B-life: the age by which `percent` % of units have failed (B10 = bLife(p, 10)). */
export function bLife(p: WeibullParameters, percent: number): number {
  check('bLife', bLifeArgs, [p, percent], ['p', 'percent']);
  return quantileOf(p, percent / 100);
}

/** Mean life scale x Gamma(1 + 1/shape). */
export function weibullMean(p: WeibullParameters): number {
  check('weibullMean', weibullParametersSchema, p, 'p');
  return meanOf(p);
}

// ---- the data ----

interface PreparedData {
  failureLogs: Float64Array;
  failureCounts: Float64Array;
  /** Every unit with a positive time, failures and suspensions alike. */
  allLogs: Float64Array;
  allCounts: Float64Array;
  failures: number;
  units: number;
  maxLog: number;
}

type Prepared = { ok: true; data: PreparedData } | { ok: false; code: WeibullFitErrorCode; message: string };

function groupOf(entry: number | LifeGroup): LifeGroup {
  return typeof entry === 'number' ? { time: entry, count: 1 } : entry;
}

/** Checks and flattens the data. Suspensions at time 0 carry no information and are left out of the sums. */
function prepare(data: LifeData): Prepared {
  const suspensions = data.suspensions ?? [];
  const size = data.failures.length + suspensions.length;
  const allLogs = new Float64Array(size);
  const allCounts = new Float64Array(size);
  const failureLogs = new Float64Array(data.failures.length);
  const failureCounts = new Float64Array(data.failures.length);
  let used = 0;
  let failures = 0;
  let units = 0;
  let maxLog = -Infinity;
  let minFailureLog = Infinity;
  let maxFailureLog = -Infinity;
  for (let pass = 0; pass < 2; pass++) {
    const list = pass === 0 ? data.failures : suspensions;
    for (let i = 0; i < list.length; i++) {
      const { time, count } = groupOf(list[i]);
      if (!(Number.isFinite(count) && count >= 0)) {
        return {
          ok: false,
          code: 'invalid_count',
          message: `A count must be a finite number >= 0, not ${count}.`,
        };
      }
      const failed = pass === 0;
      if (!(Number.isFinite(time) && (failed ? time > 0 : time >= 0))) {
        const need = failed
          ? 'a failure time must be finite and above 0'
          : 'a suspension time must be finite and >= 0';
        return { ok: false, code: 'invalid_time', message: `Cannot fit time ${time}: ${need}.` };
      }
      units += count;
      if (count === 0 || time === 0) continue;
      const log = Math.log(time);
      if (failed) {
        failureLogs[i] = log;
        failureCounts[i] = count;
        failures += count;
        if (log < minFailureLog) minFailureLog = log;
        if (log > maxFailureLog) maxFailureLog = log;
      }
      allLogs[used] = log;
      allCounts[used] = count;
      used += 1;
      if (log > maxLog) maxLog = log;
    }
  }
  // Failure times that agree to one part in a million are one time as far as a fit can tell, and a regression
  // through them would be vertical (a shape in the billions).
  if (!(maxFailureLog - minFailureLog > DISTINCT_LOG_SPAN)) {
    const have = failures > 0 ? 'all failed at one time (to one part in a million)' : 'no failures';
    return {
      ok: false,
      code: 'too_few_failures',
      message: `A Weibull fit needs failures at two or more distinct times; these data have ${have}.`,
    };
  }
  return {
    ok: true,
    data: {
      failureLogs,
      failureCounts,
      allLogs: allLogs.subarray(0, used),
      allCounts: allCounts.subarray(0, used),
      failures,
      units,
      maxLog,
    },
  };
}

function logLikelihood(d: PreparedData, p: WeibullParameters): number {
  const logScale = Math.log(p.scale);
  let sum = 0;
  for (let i = 0; i < d.failureLogs.length; i++) {
    const w = d.failureCounts[i];
    if (w > 0) sum += w * (Math.log(p.shape) - p.shape * logScale + (p.shape - 1) * d.failureLogs[i]);
  }
  for (let i = 0; i < d.allLogs.length; i++) {
    sum -= d.allCounts[i] * Math.exp(p.shape * (d.allLogs[i] - logScale));
  }
  return sum;
}

// ---- maximum likelihood ----

interface ProfilePoint {
  /** g(shape) and its derivative. */
  value: number;
  slope: number;
  /** sum_all w exp(shape (ln t - max ln t)), for the scale. */
  weight: number;
}

/** Times are shifted by the largest log so t^b never overflows: every exponent is <= 0. */
function profileEquation(d: PreparedData, meanFailureShift: number, shape: number): ProfilePoint {
  let a = 0;
  let b = 0;
  let c = 0;
  for (let i = 0; i < d.allLogs.length; i++) {
    const s = d.allLogs[i] - d.maxLog;
    const e = d.allCounts[i] * Math.exp(shape * s);
    a += e;
    b += e * s;
    c += e * s * s;
  }
  const mean = b / a;
  return {
    value: mean - 1 / shape - meanFailureShift,
    slope: c / a - mean * mean + 1 / (shape * shape),
    weight: a,
  };
}

const MAX_ITERATIONS = 400;

/** Newton's method inside a bracket [low, high] where g(low) < 0 < g(high); bisects when Newton strays. */
function solveShape(d: PreparedData): { shape: number; weight: number } {
  let meanFailureShift = 0;
  for (let i = 0; i < d.failureLogs.length; i++) {
    meanFailureShift += d.failureCounts[i] * (d.failureLogs[i] - d.maxLog);
  }
  meanFailureShift /= d.failures;
  const g = (shape: number) => profileEquation(d, meanFailureShift, shape);

  // g -> -infinity as the shape -> 0 and tends to a positive limit as it grows (two distinct failures),
  // so halving or doubling from 1 brackets the root.
  let low = 1;
  let high = 1;
  if (g(1).value > 0) {
    while (low > 1e-300 && g(low).value > 0) {
      high = low;
      low /= 2;
    }
  } else {
    while (high < 1e300 && g(high).value < 0) {
      low = high;
      high *= 2;
    }
  }
  let shape = (low + high) / 2;
  let point = g(shape);
  for (let i = 0; i < MAX_ITERATIONS && point.value !== 0; i++) {
    if (point.value < 0) low = shape;
    else high = shape;
    const newton = shape - point.value / point.slope;
    const next = newton > low && newton < high ? newton : (low + high) / 2;
    const done = Math.abs(next - shape) <= 1e-13 * shape || high - low <= 1e-15 * high;
    shape = next;
    point = g(shape);
    if (done) break;
  }
  return { shape, weight: point.weight };
}

function mleParameters(d: PreparedData): WeibullParameters {
  const { shape, weight } = solveShape(d);
  return { shape, scale: Math.exp(d.maxLog + Math.log(weight / d.failures) / shape) };
}

// ---- median-rank regression ----

export interface PlottingPosition {
  time: number;
  /** Units that failed at this time. */
  count: number;
  /** Adjusted rank (Johnson) of the last unit failed at this time; the plain order number on complete data. */
  rank: number;
  /** Bernard's median rank of that unit, (rank - 0.3) / (n + 0.4): the fraction failed by this time. */
  F: number;
}

interface SortedEntry {
  time: number;
  count: number;
  failed: boolean;
}

/** Counts summed by time, in time order: tied entries become one group, sorted as a typed array (fast). */
function countsInTimeOrder(list: LifeTimes): { times: Float64Array; counts: Map<number, number> } {
  const counts = new Map<number, number>();
  for (let i = 0; i < list.length; i++) {
    const { time, count } = groupOf(list[i]);
    if (count > 0) counts.set(time, (counts.get(time) ?? 0) + count);
  }
  return { times: Float64Array.from(counts.keys()).sort(), counts };
}

function sortedEntries(data: LifeData): SortedEntry[] {
  const f = countsInTimeOrder(data.failures);
  const s = countsInTimeOrder(data.suspensions ?? []);
  const entries: SortedEntry[] = [];
  let i = 0;
  let j = 0;
  while (i < f.times.length || j < s.times.length) {
    // At a tie, failures come first: a unit suspended at t was still working at t.
    if (j >= s.times.length || (i < f.times.length && f.times[i] <= s.times[j])) {
      entries.push({ time: f.times[i], count: f.counts.get(f.times[i])!, failed: true });
      i += 1;
    } else {
      entries.push({ time: s.times[j], count: s.counts.get(s.times[j])!, failed: false });
      j += 1;
    }
  }
  return entries;
}

/**
 * Visits each failed unit's adjusted rank in time order. Within a run of failures with no suspension between,
 * Johnson's increment (n + 1 - previous rank) / (1 + units at or after this one) stays the same, so a group of
 * c failures is c equal steps.
 */
function walkRanks(
  entries: readonly SortedEntry[],
  units: number,
  visit: (entry: SortedEntry, firstRank: number, increment: number) => void,
): void {
  let rank = 0;
  let remaining = units;
  for (const entry of entries) {
    if (entry.failed) {
      const increment = (units + 1 - rank) / (1 + remaining);
      visit(entry, rank + increment, increment);
      rank += increment * entry.count;
    }
    remaining -= entry.count;
  }
}

function medianRank(rank: number, units: number): number {
  return (rank - 0.3) / (units + 0.4);
}

/** Bernard's plotting positions with Johnson's adjusted ranks: one row per failure time. */
export function plottingPositions(data: LifeData): PlottingPosition[] {
  checkLifeData('plottingPositions', data, 'data');
  const entries = sortedEntries(data);
  const units = entries.reduce((sum, e) => sum + e.count, 0);
  const positions: PlottingPosition[] = [];
  walkRanks(entries, units, (entry, firstRank, increment) => {
    const rank = firstRank + increment * (entry.count - 1);
    positions.push({ time: entry.time, count: entry.count, rank, F: medianRank(rank, units) });
  });
  return positions;
}

/**
 * Y = ln(-ln(1 - F)) on X = ln t, one point per failed unit. The sums are centred on the mean of X so nearly
 * equal times do not cancel away the slope; the units of one time share their X, so only the sum of their
 * Y is needed: S_xy = sum_groups (x_g - mean x) sum_k y_gk.
 */
function mrrParameters(data: LifeData, units: number): WeibullParameters {
  const xs: number[] = [];
  const weights: number[] = [];
  const ySums: number[] = [];
  walkRanks(sortedEntries(data), units, (entry, firstRank, increment) => {
    let ySum = 0;
    for (let k = 0; k < entry.count; k++) {
      // A fractional count (a weight) puts its remainder on one last point of that weight.
      const weight = Math.min(1, entry.count - k);
      const F = medianRank(firstRank + increment * k, units);
      ySum += weight * Math.log(-Math.log1p(-F));
    }
    xs.push(Math.log(entry.time));
    weights.push(entry.count);
    ySums.push(ySum);
  });
  let n = 0;
  let sx = 0;
  let sy = 0;
  for (let g = 0; g < xs.length; g++) {
    n += weights[g];
    sx += weights[g] * xs[g];
    sy += ySums[g];
  }
  const mx = sx / n;
  const my = sy / n;
  let sxx = 0;
  let sxy = 0;
  for (let g = 0; g < xs.length; g++) {
    const dx = xs[g] - mx;
    sxx += weights[g] * dx * dx;
    sxy += dx * ySums[g];
  }
  const shape = sxy / sxx;
  // Y = shape X - shape ln(scale), so at X = mean X: ln(scale) = mx - my / shape.
  return { shape, scale: Math.exp(mx - my / shape) };
}

// ---- fitting ----

export interface FitOptions {
  method?: WeibullMethod;
}

/** Fits a Weibull to life data; a typed failure, never an exception, when the data cannot be fitted. */
const fitOptionsSchema = z.object({ method: z.enum(['mle', 'mrr']).optional() });

export function fitWeibull(data: LifeData, options: FitOptions = {}): WeibullFitResult {
  const issues = [...lifeDataIssues(data, 'data'), ...issuesOf(fitOptionsSchema, options, 'options')];
  if (issues.length > 0) {
    const error = new AnalyticsInputError('fitWeibull', issues);
    return { ok: false, code: 'invalid_input', message: error.message, issues };
  }
  const prepared = prepare(data);
  if (!prepared.ok) return prepared;
  const d = prepared.data;
  const method = options.method ?? 'mle';
  const params = method === 'mle' ? mleParameters(d) : mrrParameters(data, d.units);
  return {
    ok: true,
    fit: {
      method,
      shape: params.shape,
      scale: params.scale,
      failures: d.failures,
      units: d.units,
      b10: quantileOf(params, 0.1),
      b50: quantileOf(params, 0.5),
      meanLife: meanOf(params),
      logLikelihood: logLikelihood(d, params),
    },
  };
}

/** fitWeibull that throws a WeibullDataError (with the same code and message) instead of answering a failure. */
export function fitWeibullOrThrow(data: LifeData, options: FitOptions = {}): WeibullFit {
  const result = fitWeibull(data, options);
  if (!result.ok && result.issues) throw new AnalyticsInputError('fitWeibullOrThrow', result.issues);
  if (!result.ok) throw new WeibullDataError(result.code, result.message);
  return result.fit;
}

// ---- the probability plot ----

export interface PlotPoint {
  time: number;
  F: number;
  /** Weibull-paper coordinates: x = ln t, y = ln(-ln(1 - F)). */
  x: number;
  y: number;
}

export interface ProbabilityPlot {
  /** The failures at their plotting positions, with how many units failed at each time. */
  points: (PlotPoint & { count: number })[];
  /** The fitted line from the earliest to the latest plotted failure: straight on Weibull paper. */
  line: [PlotPoint, PlotPoint];
}

function plotPoint(time: number, F: number): PlotPoint {
  return { time, F, x: Math.log(time), y: Math.log(-Math.log1p(-F)) };
}

export function probabilityPlot(data: LifeData, fit: WeibullParameters): ProbabilityPlot {
  check('probabilityPlot', weibullParametersSchema, fit, 'fit');
  const positions = plottingPositions(data);
  const points = positions.map((p) => ({ ...plotPoint(p.time, p.F), count: p.count }));
  const first = positions.length > 0 ? positions[0].time : fit.scale;
  const last = positions.length > 0 ? positions[positions.length - 1].time : fit.scale;
  return {
    points,
    line: [plotPoint(first, cdfOf(fit, first)), plotPoint(last, cdfOf(fit, last))],
  };
}
