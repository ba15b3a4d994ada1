import { DEFAULT_LOCALE, isLocale } from './dates';

// The one way Lumenproof shows an amount of money, on screens, in PDFs and in e-mails: Intl.NumberFormat, given
// the decimal string itself. Intl formats a numeric string exactly (no detour through a float), so
// "99999999999.99" stays what the database holds. Amounts show two places; summaries may round to whole units.

export type MoneyOptions = {
  /** A BCP 47 tag; an unknown or empty one falls back to en-US. */
  locale?: string;
  /** Round to whole units, for charts and summaries: "$1,235". */
  whole?: boolean;
  /** Follow the amount with its ISO code ("$96.50 USD") so that no amount is ambiguous. Default true. */
  code?: boolean;
};

const formats = new Map<string, Intl.NumberFormat>();

function numberFormat(locale: string | undefined, options: Intl.NumberFormatOptions): Intl.NumberFormat {
  const tag = locale && isLocale(locale) ? locale : DEFAULT_LOCALE;
  const key = `${tag}|${JSON.stringify(options)}`;
  let f = formats.get(key);
  if (!f) {
    f = new Intl.NumberFormat(tag, options);
    formats.set(key, f);
  }
  return f;
}

// Intl takes numeric strings as exact decimals (ECMA-402, Intl.NumberFormat v3); the lib types still say number.
const exact = (amount: string | number) => amount as unknown as number;

/** "12345.5" -> "12,345.50": the amount alone, two places, grouped; the currency is shown beside it. */
export function formatAmount(amount: string | number, locale?: string): string {
  return numberFormat(locale, { minimumFractionDigits: 2, maximumFractionDigits: 2 }).format(exact(amount));
}

/**
 * "96.5", "USD" -> "$96.50 USD" (en-US). A currency without a symbol of its own in the locale is written once,
 * after the amount: "96.50 CHF". With `code: false` Intl's own rendering is kept: "$96.50", "CHF 96.50".
 */
export function formatMoney(amount: string | number, currency: string, options: MoneyOptions = {}): string {
  const places = options.whole ? 0 : 2;
  const f = numberFormat(options.locale, {
    style: 'currency',
    currency,
    minimumFractionDigits: places,
    maximumFractionDigits: places,
  });
  if (options.code === false) return f.format(exact(amount));
  const parts = f.formatToParts(exact(amount));
  const symbol = parts.find((p) => p.type === 'currency')?.value;
  const text =
    symbol === currency
      ? parts
          .filter((p) => p.type !== 'currency' && !(p.type === 'literal' && p.value.trim() === ''))
          .map((p) => p.value)
          .join('')
      : parts.map((p) => p.value).join('');
  return `${text} ${currency}`;
}
