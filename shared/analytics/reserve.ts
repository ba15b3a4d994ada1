// Warranty reserve forecast: the claims the installed, still-working units are expected to bring over the
// coming months, from a Weibull life model in months, and what they will cost.
//
// Age, one definition for the fit and the forecast: months in service, with a unit counted at the middle of the
// month it is in. The fit takes every failure and survivor at whole months completed + 0.5 (installedLifeData with
// age 'midpoint', and the server's SQL); the forecast starts a cohort of whole-month age a at a + 0.5 too
// (MID_MONTH), so a cohort in the last month of a 60-month term has half a month of cover left, not a whole one.
//
// A cohort of `survivors` units at model age a0 = a + 0.5 expects, over the next d months, counting only failures
// before the term W:
//   E(d) = survivors x [F(min(a0 + d, W)) - F(min(a0, W))] / (1 - F(a0)),
// computed as survivors x (1 - exp(H(a0) - H(min(a0 + d, W)))), H the cumulative hazard, which is the same
// number without the cancellation of 1 - F near 1. Month k expects E(k) - E(k - 1).
//
// Money: month k's failures (ages a0 + k - 1 to a0 + k) are credited at the unit credit x the rebate at the age of
// failure: full below the full-coverage months, then linear to 0 at the term (Blischke and Murthy's combination
// pro-rata policy, warranty-cost.ts), integrated over the month under the life model.
//
// Rounding: each amount is kept unrounded until it is shown, and rounded once, half-up to the cent: a cohort's
// months on its running total (so they add up to its total), a currency's total from the sum of its cohorts'
// unrounded amounts (so it can differ by a cent from the sum of the rounded cohort rows). Cohorts passed with the
// same key (one install month reaching two whole-month ages) are one row, added before rounding.

import { z } from 'zod';

import { formatCents, MONEY_PATTERN, parseCents } from '../engine/money';
import { check, finite, finiteAtLeast, weibullParametersSchema } from './validation';
import { expectedRebate } from './warranty-cost';
import type { WeibullParameters } from './weibull';

/** The Weibull cumulative hazard (t / scale)^shape, for parameters already checked. */
function hazard(p: WeibullParameters, t: number): number {
  return t <= 0 ? 0 : Math.pow(t / p.scale, p.shape);
}

/** Months added to whole months completed: the age of a unit in the middle of its month (fit and forecast). */
export const MID_MONTH = 0.5;

/** What the reserve page says about age and rounding. */
export const RESERVE_AGE_RULE =
  'Age is months in service counted at the middle of the month a unit is in (whole months completed plus half a month), for the life-model fit and for the forecast alike; cover ends at the term.';
export const RESERVE_ROUNDING_RULE =
  'Amounts are rounded once, half-up to the cent, after adding the unrounded amounts: a total can differ by a cent from the sum of the rounded rows.';

export interface ReserveCohort {
  /** Whatever identifies the cohort to the caller (a model, lot and install month); echoed back. */
  key: string;
  /** Units installed and still working today. */
  survivors: number;
  /** Whole calendar months completed today; the forecast counts the unit at the middle of its month (+ MID_MONTH). */
  ageMonths: number;
  /** The Weibull life model of these units, with the scale in months. */
  life: WeibullParameters;
  /** The warranty term; null when no term caps the forecast. */
  termMonths: number | null;
  /** Full coverage below this age, then linear proration to 0 at the term; null or >= term: no proration. */
  fullCoverageMonths: number | null;
  /** Credit per claimed unit at full coverage, as a decimal string ("85.00"). */
  unitCredit: string;
  currency: string;
}

export interface ReserveOptions {
  /** Months ahead to forecast, each month reported on its own; 12 by default. */
  months?: number;
}

export interface CohortReserve {
  key: string;
  currency: string;
  /** Expected claims over the whole horizon, and month by month (month 1 first). */
  expectedClaims: number;
  monthlyClaims: number[];
  /** Decimal strings, rounded once to the cent. */
  amount: string;
  monthlyAmounts: string[];
  /** The same amounts unrounded, in cents (for adding up: round only the sum). */
  exactCents: number;
  monthlyExactCents: number[];
}

export interface CurrencyReserve {
  currency: string;
  expectedClaims: number;
  monthlyClaims: number[];
  amount: string;
  monthlyAmounts: string[];
  exactCents: number;
  monthlyExactCents: number[];
}

export interface ReserveForecast {
  months: number;
  cohorts: CohortReserve[];
  /** One row per currency, in code order: amounts in different currencies are never added. */
  totals: CurrencyReserve[];
}

const nullableTerm = (what: string) =>
  finite(what)
    .refine((v) => v >= 0, `Expected ${what} >= 0.`)
    .nullable();

const claimsArgs = z.tuple([
  weibullParametersSchema,
  finiteAtLeast(0, 'a number of survivors'),
  finiteAtLeast(0, 'an age in months'),
  finite('a number of months').refine((m) => Number.isInteger(m) && m >= 0, 'Expected whole months >= 0.'),
  nullableTerm('a term').optional(),
]);

const CLAIMS_ARG_NAMES = ['life', 'survivors', 'age', 'months', 'termMonths'];

function claimsBetween(
  life: WeibullParameters,
  survivors: number,
  age: number,
  months: number,
  termMonths: number | null,
): number {
  const end = termMonths === null ? age + months : Math.min(age + months, termMonths);
  if (!(end > age) || survivors <= 0) return 0;
  const probability = -Math.expm1(hazard(life, age) - hazard(life, end));
  return survivors * Math.min(1, Math.max(0, probability));
}

function monthlyClaimsOf(
  life: WeibullParameters,
  survivors: number,
  age: number,
  months: number,
  termMonths: number | null,
): number[] {
  const monthly: number[] = [];
  let previous = 0;
  for (let k = 1; k <= months; k++) {
    const cumulative = claimsBetween(life, survivors, age, k, termMonths);
    monthly.push(Math.max(0, cumulative - previous));
    previous = Math.max(previous, cumulative);
  }
  return monthly;
}

/**
 * Expected claims from `survivors` units of model age `age` (months, continuous: a cohort's whole months + MID_MONTH)
 * over the next `months` months, conditional on survival to today and capped at the term (null: no cap).
 */
export function expectedClaims(
  life: WeibullParameters,
  survivors: number,
  age: number,
  months: number,
  termMonths: number | null = null,
): number {
  check('expectedClaims', claimsArgs, [life, survivors, age, months, termMonths], CLAIMS_ARG_NAMES);
  return claimsBetween(life, survivors, age, months, termMonths);
}

/** Month k's expected claims, k = 1..months: E(k) - E(k - 1), never below 0. Same ages as expectedClaims. */
export function monthlyExpectedClaims(
  life: WeibullParameters,
  survivors: number,
  age: number,
  months: number,
  termMonths: number | null = null,
): number[] {
  check('monthlyExpectedClaims', claimsArgs, [life, survivors, age, months, termMonths], CLAIMS_ARG_NAMES);
  return monthlyClaimsOf(life, survivors, age, months, termMonths);
}

function roundHalfUp(cents: number): number {
  return Math.floor(cents + 0.5);
}

/** Running-total rounding: each month's cents so that the months add up to the rounded total exactly. */
function roundedRun(exact: readonly number[]): { total: number; months: number[] } {
  let sum = 0;
  let rounded = 0;
  const months: number[] = [];
  for (const e of exact) {
    sum += e;
    const next = roundHalfUp(sum);
    months.push(next - rounded);
    rounded = next;
  }
  return { total: rounded, months };
}

const cohortSchema = z
  .object({
    key: z.string({ error: 'Expected a key.' }),
    survivors: finiteAtLeast(0, 'a number of survivors'),
    ageMonths: finiteAtLeast(0, 'an age in months'),
    life: weibullParametersSchema,
    termMonths: finite('a term')
      .refine((v) => v > 0, 'Expected a term above 0 months.')
      .nullable(),
    fullCoverageMonths: nullableTerm('a full-coverage period'),
    unitCredit: z
      .string({ error: 'Expected an amount like 85.00.' })
      .regex(MONEY_PATTERN, 'Expected an amount like 85.00.'),
    currency: z.string().regex(/^[A-Z]{3}$/, 'Expected a currency code like USD.'),
  })
  .refine((c) => c.termMonths !== null || c.fullCoverageMonths === null, {
    path: ['fullCoverageMonths'],
    message: 'A full-coverage period needs a term.',
  });

const forecastArgs = z.tuple([
  z.array(cohortSchema, { error: 'Expected a list of cohorts.' }),
  z.object({
    months: finite('a number of months')
      .refine((m) => Number.isInteger(m) && m >= 1 && m <= 600, 'Expected whole months from 1 to 600.')
      .optional(),
  }),
]);

interface CohortSums {
  key: string;
  currency: string;
  claims: number[];
  exactCents: number[];
}

/** The unrounded claims and cents of one cohort, month by month, at model age ageMonths + MID_MONTH. */
function cohortExact(c: ReserveCohort, months: number): { claims: number[]; cents: number[] } {
  const age = c.ageMonths + MID_MONTH;
  const claims = monthlyClaimsOf(c.life, c.survivors, age, months, c.termMonths);
  const unitCents = parseCents(c.unitCredit);
  const policy = { termMonths: c.termMonths, fullCoverageMonths: c.fullCoverageMonths };
  const prorates =
    c.termMonths !== null && c.fullCoverageMonths !== null && c.fullCoverageMonths < c.termMonths;
  const cents = claims.map((claimed, k) =>
    prorates && claimed > 0
      ? c.survivors * unitCents * expectedRebate(c.life, age + k, age + k + 1, age, policy)
      : claimed * unitCents,
  );
  return { claims, cents };
}

function presentRow(sums: CohortSums): CohortReserve {
  const run = roundedRun(sums.exactCents);
  return {
    key: sums.key,
    currency: sums.currency,
    expectedClaims: sums.claims.reduce((a, b) => a + b, 0),
    monthlyClaims: sums.claims,
    amount: formatCents(run.total),
    monthlyAmounts: run.months.map(formatCents),
    exactCents: sums.exactCents.reduce((a, b) => a + b, 0),
    monthlyExactCents: sums.exactCents,
  };
}

export function forecastReserve(
  cohorts: readonly ReserveCohort[],
  options: ReserveOptions = {},
): ReserveForecast {
  check('forecastReserve', forecastArgs, [cohorts, options], ['cohorts', 'options']);
  const months = options.months ?? 12;
  const byKey = new Map<string, CohortSums>();
  const byCurrency = new Map<string, CohortSums>();
  const add = (map: Map<string, CohortSums>, id: string, key: string, currency: string) => {
    let sums = map.get(id);
    if (!sums) {
      sums = {
        key,
        currency,
        claims: new Array<number>(months).fill(0),
        exactCents: new Array<number>(months).fill(0),
      };
      map.set(id, sums);
    }
    return sums;
  };
  for (const cohort of cohorts) {
    const { claims, cents } = cohortExact(cohort, months);
    const row = add(byKey, `${cohort.currency}\u0000${cohort.key}`, cohort.key, cohort.currency);
    const total = add(byCurrency, cohort.currency, cohort.currency, cohort.currency);
    for (let k = 0; k < months; k++) {
      row.claims[k] += claims[k];
      row.exactCents[k] += cents[k];
      total.claims[k] += claims[k];
      total.exactCents[k] += cents[k];
    }
  }
  const currencies = [...byCurrency.keys()].sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));
  const totals = currencies.map((currency) => {
    const { key: _key, ...row } = presentRow(byCurrency.get(currency)!);
    void _key;
    return row;
  });
  return { months, cohorts: [...byKey.values()].map(presentRow), totals };
}
