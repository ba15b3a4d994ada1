import { describe, expect, it } from 'vitest';
import { formatAmount, formatMoney } from '../../../shared/money';

// The expected strings follow the Unicode CLDR locale data that Intl.NumberFormat implements (common/main/en.xml
// and de.xml; the patterns and symbols below are from memory): en "#,##0.00" and currency "¤#,##0.00", the en
// symbols "$" (USD), "CA$" (CAD), none for CHF; de "#,##0.00 ¤" with "." grouping and "," decimals.
describe('money for people', () => {
  it('groups an amount with two places', () => {
    expect(formatAmount('1234567.8')).toBe('1,234,567.80'); // CLDR en "#,##0.00", from memory
    expect(formatAmount('-1000')).toBe('-1,000.00'); // CLDR en minusSign "-"
    expect(formatAmount('1234.5', 'de-DE')).toBe('1.234,50'); // CLDR de: group ".", decimal ","
  });

  it('keeps a DECIMAL(14,2) amount exact: no float on the way', () => {
    // 99999999999.99 is not representable as a double (IEEE 754 binary64 has 53 bits of significand).
    expect(formatAmount('999999999999.99')).toBe('999,999,999,999.99');
    expect(formatMoney('999999999999.99', 'USD')).toBe('$999,999,999,999.99 USD');
  });

  it('writes symbol and code so that no amount is ambiguous', () => {
    expect(formatMoney('96.5', 'USD')).toBe('$96.50 USD'); // CLDR en: USD symbol "$"
    expect(formatMoney('96.5', 'CAD')).toBe('CA$96.50 CAD'); // CLDR en: CAD symbol "CA$"
    expect(formatMoney('-96.5', 'USD')).toBe('-$96.50 USD'); // CLDR en currency pattern "¤#,##0.00"
    expect(formatMoney('1234.5', 'EUR', { locale: 'de-DE' })).toBe('1.234,50\u00a0€ EUR'); // CLDR de "#,##0.00 ¤"
  });

  it('writes a currency without its own symbol once, after the amount', () => {
    // CLDR en has no symbol for CHF: Intl shows the code itself, which is not repeated.
    expect(formatMoney('1234.5', 'CHF')).toBe('1,234.50 CHF');
    expect(formatMoney('-1234.5', 'CHF')).toBe('-1,234.50 CHF');
  });

  it('rounds to whole units for summaries, half away from zero', () => {
    // ECMA-402 roundingMode default "halfExpand"
    expect(formatMoney('1234.5', 'USD', { whole: true, code: false })).toBe('$1,235');
    expect(formatMoney('1234.49', 'USD', { whole: true, code: false })).toBe('$1,234');
  });

  it('falls back to en-US for an unknown locale', () => {
    expect(formatAmount('1234.5', 'xx-invalid-!!')).toBe('1,234.50');
  });
});
