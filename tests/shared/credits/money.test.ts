import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  baseCode,
  codeCandidate,
  formatMemoNumber,
  MEMO_NUMBER_PATTERN,
} from '../../../shared/credits/memo-number';
import { negate, normalizeAmount, sumAmounts } from '../../../shared/credits/money';

// Exact decimal money: every sum is checked against BigInt arithmetic on whole cents (exact by construction).
const centsToString = (c: bigint) => {
  const neg = c < 0n;
  const abs = neg ? -c : c;
  return `${neg ? '-' : ''}${abs / 100n}.${String(abs % 100n).padStart(2, '0')}`;
};

describe('credit money', () => {
  it('sums 1,000 odd amounts exactly', () => {
    let seed = 20260417;
    const rand = () => (seed = (seed * 1103515245 + 12345) % 2 ** 31);
    const cents = Array.from({ length: 1000 }, () => BigInt(rand() % 10_000_000) - 1_000_000n);
    const amounts = cents.map(centsToString);
    const exact = centsToString(cents.reduce((a, b) => a + b, 0n));
    expect(sumAmounts(amounts)).toBe(exact);
  });

  it('0.10 + 0.20 is 0.30, and a million cents are 10,000.00', () => {
    expect(sumAmounts(['0.10', '0.20'])).toBe('0.30');
    expect(sumAmounts(Array(1_000_000).fill('0.01'))).toBe('10000.00');
    expect(sumAmounts([])).toBe('0.00');
  });

  it('any list of two-place amounts sums like BigInt cents (property)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.bigInt({ min: -99_999_999_999_99n, max: 99_999_999_999_99n }), { maxLength: 200 }),
        (cs) => {
          expect(sumAmounts(cs.map(centsToString))).toBe(centsToString(cs.reduce((a, b) => a + b, 0n)));
        },
      ),
    );
  });

  it('negates, normalises half-up and groups for the screens', () => {
    expect(negate('12.30')).toBe('-12.30');
    expect(negate('-0.01')).toBe('0.01');
    // half-up to the cent: common practice, no published source
    expect(normalizeAmount('2.345')).toBe('2.35');
    expect(normalizeAmount('96.5')).toBe('96.50');
  });
});

describe('memo numbers (our own format)', () => {
  it('CM-<letters>-<year>-<six digits>', () => {
    expect(formatMemoNumber('ALD', 2026, 42)).toBe('CM-ALD-2026-000042');
    expect(MEMO_NUMBER_PATTERN.test('CM-ALD-2026-000042')).toBe(true);
    expect(MEMO_NUMBER_PATTERN.test('CM-ALD12-2026-000042')).toBe(true);
    expect(MEMO_NUMBER_PATTERN.test('CM-AL-2026-42')).toBe(false);
  });

  it('codes from the name: letters only, accents dropped, a digit when taken', () => {
    expect(baseCode('Aldercrest Lighting')).toBe('ALD');
    expect(baseCode('Veltra Luminaires')).toBe('VEL');
    expect(baseCode('Éclat 3D')).toBe('ECL');
    expect(baseCode('4 U')).toBe('UXX');
    expect(baseCode('123')).toBe('MFR');
    expect(codeCandidate('Aldercrest', 1)).toBe('ALD');
    expect(codeCandidate('Aldercrest', 2)).toBe('ALD2');
  });
});
