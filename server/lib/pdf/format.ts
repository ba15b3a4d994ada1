import { DEFAULT_LOCALE, formatCalendarDate } from '../../../shared/dates';
import { MONEY_PATTERN, parseCents } from '../../../shared/engine/money';

// Formatting for documents: dates in the recipient's locale (the organisation's), calendar dates never moved by a
// zone, so the same data and locale print the same everywhere.

const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})$/;

/**
 * A calendar date as the recipient reads it, through the one date rule (shared/dates.ts): "2025-03-04" is
 * "March 4, 2025" in en-US and "4 March 2025" in en-GB, and never another day whatever the zone.
 */
export function formatDate(iso: string, locale: string = DEFAULT_LOCALE): string {
  return formatCalendarDate(iso, { locale }, 'long');
}

/** Noon UTC of a calendar date: the document's own date as its PDF metadata timestamp. */
export function dateAsTimestamp(iso: string): Date {
  if (!ISO_DATE.test(iso)) throw new Error(`expected a date as YYYY-MM-DD, got "${iso}"`);
  return new Date(`${iso}T12:00:00Z`);
}

/** A decimal string ("96", "96.5", "-96.50") as integer cents. */
export function toCents(amount: string): number {
  const negative = amount.startsWith('-');
  const abs = negative ? amount.slice(1) : amount;
  if (!MONEY_PATTERN.test(abs)) throw new Error(`expected an amount like "96.00", got "${amount}"`);
  const cents = parseCents(abs);
  return negative ? -cents : cents;
}

/** 66.6667 -> "66.67 %"; whole numbers without decimals: "100 %". */
export function formatPercent(value: number): string {
  const r = Math.round(value * 100) / 100;
  return `${Number.isInteger(r) ? String(r) : r.toFixed(2).replace(/0$/, '')} %`;
}
