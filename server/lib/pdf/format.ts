import { formatCents, MONEY_PATTERN, parseCents } from '../../../shared/engine/money';

// Formatting for documents: no time zones and no locale surprises, so the same data prints the same everywhere.

const MONTHS = [
  'January',
  'February',
  'March',
  'April',
  'May',
  'June',
  'July',
  'August',
  'September',
  'October',
  'November',
  'December',
];

const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})$/;

/** "2025-03-04" -> "4 March 2025". */
export function formatDate(iso: string): string {
  const m = ISO_DATE.exec(iso);
  if (!m) throw new Error(`expected a date as YYYY-MM-DD, got "${iso}"`);
  const month = Number(m[2]);
  if (month < 1 || month > 12) throw new Error(`no month ${m[2]} in "${iso}"`);
  return `${Number(m[3])} ${MONTHS[month - 1]} ${m[1]}`;
}

/** Noon UTC of a calendar date: the document's own date as its PDF metadata timestamp. */
export function dateAsTimestamp(iso: string): Date {
  if (!ISO_DATE.test(iso)) throw new Error(`expected a date as YYYY-MM-DD, got "${iso}"`);
  return new Date(`${iso}T12:00:00Z`);
}

const SYMBOLS: Record<string, string> = { USD: '$', CAD: 'CA$', EUR: '€', GBP: '£', AUD: 'A$', MXN: 'MX$' };

/** Integer cents as "1,234.50" with thousands separators; negative amounts keep their sign. */
export function groupCents(cents: number): string {
  const plain = formatCents(cents);
  const negative = plain.startsWith('-');
  const [whole, fraction] = (negative ? plain.slice(1) : plain).split('.');
  const grouped = whole.replace(/\B(?=(\d{3})+(?!\d))/g, ',');
  return `${negative ? '-' : ''}${grouped}.${fraction}`;
}

/** "96.5", "USD" -> "$96.50 USD"; the code always follows so that no amount is ambiguous. */
export function formatMoney(amount: string | number, currency: string): string {
  const cents = typeof amount === 'number' ? amount : toCents(amount);
  const symbol = SYMBOLS[currency] ?? '';
  const text = groupCents(Math.abs(cents));
  return `${cents < 0 ? '-' : ''}${symbol}${text} ${currency}`;
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
