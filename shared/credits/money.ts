import Decimal from 'decimal.js';

// Money for credits: decimal strings with two places, summed and compared with decimal.js (never floats).
// Decimal.js keeps 20 significant digits by default; DECIMAL(14,2) sums of millions of rows need no more
// than 20, and the precision is raised anyway so that no sum is ever rounded.
const D = Decimal.clone({ precision: 40, rounding: Decimal.ROUND_HALF_UP });

export const AMOUNT_PATTERN = /^-?\d{1,12}(\.\d{1,2})?$/;

export function toDecimal(amount: string | number | Decimal): Decimal {
  return new D(amount);
}

/** Adds decimal strings exactly; "" for none is "0.00". */
export function sumAmounts(amounts: Iterable<string>): string {
  let total = new D(0);
  for (const a of amounts) total = total.plus(a);
  return total.toFixed(2);
}

export function negate(amount: string): string {
  return new D(amount).negated().toFixed(2);
}

/** Two places, half-up (common practice, no published source). */
export function normalizeAmount(amount: string | number | Decimal): string {
  return new D(amount).toFixed(2);
}

export function amountsEqual(a: string, b: string): boolean {
  return new D(a).equals(b);
}
