// Expected warranty cost per unit sold under a Weibull life model, after Blischke and Murthy (Warranty Cost
// Analysis, 1994; Product Warranty Handbook, 1996):
//
// - free replacement (non-renewing, first failures only): c F(W);
// - linear pro-rata over W: the buyer of a unit failing at age t < W is refunded c (1 - t / W), so
//     E[cost] = c integral_0^W (1 - t / W) f(t) dt = c [F(W) - mu(W) / W],   mu(x) = integral_0^x t f(t) dt;
// - the combination policy (full cover to W1, then linear pro-rata to 0 at W), the form our policies take:
//     E[cost] = c [F(W1) + integral_W1^W (W - t) / (W - W1) f(t) dt]
//             = c [F(W1) + (W (F(W) - F(W1)) - (mu(W) - mu(W1))) / (W - W1)].
//
// For the Weibull, mu(x) = scale Gamma(1 + 1/shape) P(1 + 1/shape, (x / scale)^shape), P the regularised lower
// incomplete gamma function.
//
// The reserve needs the same integral over one forecast month and conditional on survival to today's age:
// expectedRebate gives integral_t0^t1 q(t) f(t) dt / R(a), q the rebate fraction (1, then linear to 0).

import { z } from 'zod';

import { logGamma, regularizedGamma } from './gamma';
import { check, finite, weibullParametersSchema } from './validation';
import type { WeibullParameters } from './weibull';

/** The Weibull cumulative hazard (t / scale)^shape, for parameters already checked. */
function hazard(p: WeibullParameters, t: number): number {
  return t <= 0 ? 0 : Math.pow(t / p.scale, p.shape);
}

export interface RebatePolicy {
  /** W: no rebate from this age on; null: no term (full cover for ever). */
  termMonths: number | null;
  /** W1: full cover below this age, then linear to 0 at W; null, or >= W: full cover to the term. */
  fullCoverageMonths: number | null;
}

const policySchema = z
  .object({
    termMonths: finite('a term')
      .refine((v) => v > 0, 'Expected a term above 0.')
      .nullable(),
    fullCoverageMonths: finite('a full-coverage period')
      .refine((v) => v >= 0, 'Expected a full-coverage period >= 0.')
      .nullable(),
  })
  .refine((p) => p.termMonths !== null || p.fullCoverageMonths === null, {
    path: ['fullCoverageMonths'],
    message: 'A full-coverage period needs a term.',
  });

/** The rebate fraction for a failure at age t (continuous): 1, then linear to 0 at the term, 0 after. */
export function rebateFraction(t: number, policy: RebatePolicy): number {
  check('rebateFraction', z.tuple([finite('an age'), policySchema]), [t, policy], ['t', 'policy']);
  return rebateOf(t, policy);
}

function rebateOf(t: number, { termMonths: W, fullCoverageMonths }: RebatePolicy): number {
  if (W === null) return 1;
  if (t >= W) return 0;
  const W1 = fullCoverageMonths === null ? W : Math.min(fullCoverageMonths, W);
  if (t < W1) return 1;
  return (W - t) / (W - W1);
}

/**
 * integral_t0^t1 t f(t) dt for the Weibull, divided by R(given) (survival to `given`, <= t0). Taken from the
 * upper incomplete gamma Q when the interval lies in the tail, so neither end loses digits to 1 - P.
 */
function partialMeanBetween(life: WeibullParameters, t0: number, t1: number, given: number): number {
  const s = 1 + 1 / life.shape;
  const h0 = hazard(life, t0);
  const h1 = hazard(life, t1);
  const hg = hazard(life, given);
  const g0 = regularizedGamma(s, h0);
  const g1 = regularizedGamma(s, h1);
  // scale Gamma(s) [Q0 - Q1] / R(given), each term in logarithms: R(given) and Q can both underflow. The hazards
  // are subtracted from each other first (hg - h0 is exactly 0 when the interval starts today).
  const lnGamma = logGamma(s);
  if (g0.p > 0.5) {
    return (
      life.scale *
      (Math.exp(lnGamma + (hg - h0) + g0.logQPlusX) - Math.exp(lnGamma + (hg - h1) + g1.logQPlusX))
    );
  }
  return life.scale * (Math.exp(lnGamma + hg + g1.logP) - Math.exp(lnGamma + hg + g0.logP));
}

/** (F(t1) - F(t0)) / R(given), without the cancellation of 1 - F near 1. */
function failingBetween(life: WeibullParameters, t0: number, t1: number, given: number): number {
  if (!(t1 > t0)) return 0;
  const hg = hazard(life, given);
  return Math.exp(hg - hazard(life, t0)) * -Math.expm1(hazard(life, t0) - hazard(life, t1));
}

/**
 * Expected rebate, as a fraction of the unit credit, per unit working at age `given`, for failures at ages in
 * [t0, t1): integral q(t) f(t) dt / R(given). Free replacement where q = 1; linear pro-rata past W1.
 */
export function expectedRebate(
  life: WeibullParameters,
  t0: number,
  t1: number,
  given: number,
  policy: RebatePolicy,
): number {
  check(
    'expectedRebate',
    z
      .tuple([weibullParametersSchema, finite('t0'), finite('t1'), finite('an age'), policySchema])
      .refine(([, a, b, g]) => g >= 0 && a >= g && b >= a, 'Expected 0 <= given <= t0 <= t1.'),
    [life, t0, t1, given, policy],
    ['life', 't0', 't1', 'given', 'policy'],
  );
  return rebateBetween(life, t0, t1, given, policy);
}

function rebateBetween(
  life: WeibullParameters,
  t0: number,
  t1: number,
  given: number,
  policy: RebatePolicy,
): number {
  const W = policy.termMonths;
  const end = W === null ? t1 : Math.min(t1, W);
  if (!(end > t0)) return 0;
  const W1 = W === null || policy.fullCoverageMonths === null ? end : Math.min(policy.fullCoverageMonths, W);
  let total = 0;
  // Full cover on [t0, min(end, W1)).
  const fullEnd = Math.min(end, W1);
  if (fullEnd > t0) total += failingBetween(life, t0, fullEnd, given);
  // Linear on [max(t0, W1), end): (W F - mu) / (W - W1) over the piece.
  const proStart = Math.max(t0, W1);
  if (W !== null && end > proStart) {
    const failing = failingBetween(life, proStart, end, given);
    const mean = partialMeanBetween(life, proStart, end, given);
    total += Math.max(0, (W * failing - mean) / (W - W1));
  }
  return Math.max(0, total);
}

export interface ProRataTerms {
  /** W, above 0. */
  termMonths: number;
  /** W1, 0 (the default: pure linear pro-rata) to W. */
  fullCoverageMonths?: number;
}

const unitCostSchema = finite('a unit cost').refine((c) => c >= 0, 'Expected a unit cost >= 0.');
const proRataArgs = z.tuple([
  weibullParametersSchema,
  z
    .object({
      termMonths: finite('a term').refine((v) => v > 0, 'Expected a term above 0.'),
      fullCoverageMonths: finite('a full-coverage period')
        .refine((v) => v >= 0, 'Expected a full-coverage period >= 0.')
        .optional(),
    })
    .refine((p) => (p.fullCoverageMonths ?? 0) <= p.termMonths, {
      path: ['fullCoverageMonths'],
      message: 'The full-coverage period cannot pass the term.',
    }),
  unitCostSchema,
]);

/**
 * Expected warranty cost per unit sold (Blischke & Murthy): full cover to W1, then linear pro-rata to 0 at W;
 * with W1 = 0 the plain linear pro-rata policy, c [F(W) - mu(W) / W]. In the units of `unitCost`.
 */
export function proRataWarrantyCost(life: WeibullParameters, terms: ProRataTerms, unitCost: number): number {
  check('proRataWarrantyCost', proRataArgs, [life, terms, unitCost], ['life', 'terms', 'unitCost']);
  const policy = { termMonths: terms.termMonths, fullCoverageMonths: terms.fullCoverageMonths ?? 0 };
  return unitCost * rebateBetween(life, 0, terms.termMonths, 0, policy);
}

/** Free replacement, first failures only (a replacement's own failures belong to its own cohort): c F(W). */
export function freeReplacementWarrantyCost(
  life: WeibullParameters,
  termMonths: number,
  unitCost: number,
): number {
  check(
    'freeReplacementWarrantyCost',
    z.tuple([
      weibullParametersSchema,
      finite('a term').refine((v) => v > 0, 'Expected a term above 0.'),
      unitCostSchema,
    ]),
    [life, termMonths, unitCost],
    ['life', 'termMonths', 'unitCost'],
  );
  return unitCost * -Math.expm1(-hazard(life, termMonths));
}
