// Money as decimal strings in, integer cents inside, decimal strings out: no float drift.

/** "96", "96.5" or "96.50" -> 9650. The string is already validated against MONEY_PATTERN. */
export function parseCents(amount: string): number {
  const dot = amount.indexOf('.');
  if (dot === -1) return Number(amount) * 100;
  const whole = Number(amount.slice(0, dot));
  const fraction = amount.slice(dot + 1);
  const cents = fraction.length === 1 ? Number(fraction) * 10 : Number(fraction);
  return whole * 100 + cents;
}

/** 9650 -> "96.50"; negative amounts keep their sign. */
export function formatCents(cents: number): string {
  const sign = cents < 0 ? '-' : '';
  const abs = Math.abs(cents);
  const whole = Math.floor(abs / 100);
  const rest = abs - whole * 100;
  return `${sign}${whole}.${rest < 10 ? '0' : ''}${rest}`;
}

/**
 * cents x numerator / denominator, rounded half-up to a whole cent, in integer arithmetic
 * (all arguments non-negative integers, denominator > 0, the products within Number.MAX_SAFE_INTEGER).
 */
export function scaleCentsHalfUp(cents: number, numerator: number, denominator: number): number {
  const product = cents * numerator;
  return Math.floor((2 * product + denominator) / (2 * denominator));
}

export const MONEY_PATTERN = /^\d+(\.\d{1,2})?$/;
