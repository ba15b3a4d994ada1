// Warranty reserve forecast: the claims the installed, still-working units are expected to bring over the
// coming months, from a Weibull life model in months, and what they will cost.
//
// A cohort (units of one model, lot and warranty terms installed in the same month) has `survivors` units working
// at whole-month age a. Its expected claims over the next d months, given survival to today and counting only
// failures inside the warranty term W:
//   E(d) = survivors x [F(min(a + d, W)) - F(min(a, W))] / (1 - F(a)),
// computed as survivors x (1 - exp(H(a) - H(min(a + d, W)))), H the cumulative hazard, which is the same
// number without the cancellation of 1 - F near 1. Month k expects E(k) - E(k - 1).
//
// Money: a failure in month k happens at whole-month age a + k - 1 and is credited at the unit credit x the
// coverage at that age (100 % below the full-coverage months, then linear to 0 at the term, as the engine's
// coveragePercent). Amounts are integer cents, rounded half-up on the running total so the months add up to
// the cohort's total exactly; a currency's figures are the sums of its cohorts' cents.

import { formatCents, MONEY_PATTERN, parseCents } from '../engine/money';
import { weibullCumulativeHazard, type WeibullParameters } from './weibull';

export interface ReserveCohort {
  /** Whatever identifies the cohort to the caller (a model, lot and install month); echoed back. */
  key: string;
  /** Units installed and still working today. */
  survivors: number;
  /** Whole calendar months in service today. */
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
  /** Decimal strings, exact to the cent. */
  amount: string;
  monthlyAmounts: string[];
}

export interface CurrencyReserve {
  currency: string;
  expectedClaims: number;
  monthlyClaims: number[];
  amount: string;
  monthlyAmounts: string[];
}

export interface ReserveForecast {
  months: number;
  cohorts: CohortReserve[];
  /** One row per currency, in code order: amounts in different currencies are never added. */
  totals: CurrencyReserve[];
}

/**
 * Expected claims from `survivors` units at age `ageMonths` over the next `months` months, conditional on
 * survival to today and capped at the term (null: no cap). Never negative, never above the survivors.
 */
export function expectedClaims(
  life: WeibullParameters,
  survivors: number,
  ageMonths: number,
  months: number,
  termMonths: number | null = null,
): number {
  const end = termMonths === null ? ageMonths + months : Math.min(ageMonths + months, termMonths);
  if (!(end > ageMonths) || survivors <= 0) return 0;
  const probability = -Math.expm1(
    weibullCumulativeHazard(life, ageMonths) - weibullCumulativeHazard(life, end),
  );
  return survivors * Math.min(1, Math.max(0, probability));
}

/** Month k's expected claims, k = 1..months: E(k) - E(k - 1), never below 0. */
export function monthlyExpectedClaims(
  life: WeibullParameters,
  survivors: number,
  ageMonths: number,
  months: number,
  termMonths: number | null = null,
): number[] {
  const monthly: number[] = [];
  let previous = 0;
  for (let k = 1; k <= months; k++) {
    const cumulative = expectedClaims(life, survivors, ageMonths, k, termMonths);
    monthly.push(Math.max(0, cumulative - previous));
    previous = Math.max(previous, cumulative);
  }
  return monthly;
}

/** The share of the unit credit paid for a failure at this whole-month age (the engine's coverage rule). */
export function coverageFraction(
  ageMonths: number,
  termMonths: number | null,
  fullCoverageMonths: number | null,
): number {
  if (termMonths === null) return 1;
  if (ageMonths >= termMonths) return 0;
  const full = fullCoverageMonths ?? termMonths;
  if (ageMonths < full || full >= termMonths) return 1;
  return (termMonths - ageMonths) / (termMonths - full);
}

function roundHalfUp(cents: number): number {
  return Math.floor(cents + 0.5);
}

function validateCohort(c: ReserveCohort): void {
  const fail = (what: string) => {
    throw new RangeError(`Reserve cohort ${c.key}: ${what}.`);
  };
  if (!(Number.isFinite(c.survivors) && c.survivors >= 0)) fail('survivors must be a number >= 0');
  if (!(Number.isFinite(c.ageMonths) && c.ageMonths >= 0)) fail('the age must be a number of months >= 0');
  if (!(
    c.life.shape > 0 &&
    c.life.scale > 0 &&
    Number.isFinite(c.life.shape) &&
    Number.isFinite(c.life.scale)
  )) {
    fail('the life model needs a positive shape and scale');
  }
  if (!MONEY_PATTERN.test(c.unitCredit))
    fail(`the unit credit "${c.unitCredit}" is not an amount like 85.00`);
}

function cohortReserve(c: ReserveCohort, months: number): { row: CohortReserve; cents: number[] } {
  validateCohort(c);
  const monthlyClaims = monthlyExpectedClaims(c.life, c.survivors, c.ageMonths, months, c.termMonths);
  const unitCents = parseCents(c.unitCredit);
  const cents: number[] = [];
  let exact = 0;
  let rounded = 0;
  for (let k = 0; k < months; k++) {
    exact +=
      monthlyClaims[k] * unitCents * coverageFraction(c.ageMonths + k, c.termMonths, c.fullCoverageMonths);
    const next = roundHalfUp(exact);
    cents.push(next - rounded);
    rounded = next;
  }
  return {
    row: {
      key: c.key,
      currency: c.currency,
      expectedClaims: expectedClaims(c.life, c.survivors, c.ageMonths, months, c.termMonths),
      monthlyClaims,
      amount: formatCents(rounded),
      monthlyAmounts: cents.map(formatCents),
    },
    cents,
  };
}

export function forecastReserve(
  cohorts: readonly ReserveCohort[],
  options: ReserveOptions = {},
): ReserveForecast {
  const months = options.months ?? 12;
  if (!(Number.isInteger(months) && months >= 1))
    throw new RangeError(`Forecast months must be >= 1, not ${months}.`);
  const rows: CohortReserve[] = [];
  const byCurrency = new Map<string, { claims: number[]; cents: number[] }>();
  for (const cohort of cohorts) {
    const { row, cents } = cohortReserve(cohort, months);
    rows.push(row);
    const sums = byCurrency.get(row.currency) ?? {
      claims: new Array<number>(months).fill(0),
      cents: new Array<number>(months).fill(0),
    };
    for (let k = 0; k < months; k++) {
      sums.claims[k] += row.monthlyClaims[k];
      sums.cents[k] += cents[k];
    }
    byCurrency.set(row.currency, sums);
  }
  const currencies = [...byCurrency.keys()].sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));
  const totals = currencies.map((currency) => {
    const { claims, cents } = byCurrency.get(currency)!;
    return {
      currency,
      expectedClaims: claims.reduce((sum, m) => sum + m, 0),
      monthlyClaims: claims,
      amount: formatCents(cents.reduce((sum, m) => sum + m, 0)),
      monthlyAmounts: cents.map(formatCents),
    };
  });
  return { months, cohorts: rows, totals };
}
