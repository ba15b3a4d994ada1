import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  CLAIM_NUMBER_ALPHABET,
  CLAIM_NUMBER_PATTERN,
  isValidClaimNumber,
  newClaimNumber,
  normalizeClaimNumber,
} from '../../../shared/claims/claim-number';

describe('claim numbers', () => {
  it('are LP, the filing year and month, and six symbols without look-alikes', () => {
    const n = newClaimNumber(new Date('2026-12-03T10:00:00Z'));
    expect(n).toMatch(/^LP-2612-/);
    expect(n).toMatch(CLAIM_NUMBER_PATTERN);
    expect(CLAIM_NUMBER_ALPHABET).not.toMatch(/[01OILUV]/);
    expect(new Set(CLAIM_NUMBER_ALPHABET).size).toBe(29);
  });

  it('are read back whatever the case and spacing; "LP" may be left out', () => {
    const n = newClaimNumber(new Date('2026-01-15T00:00:00Z'));
    const spoken = n.toLowerCase().replace(/-/g, ' ');
    expect(normalizeClaimNumber(spoken)).toBe(n);
    expect(normalizeClaimNumber(n.slice(3))).toBe(n);
    expect(normalizeClaimNumber('hello')).toBeNull();
  });

  it('catch any one wrong symbol and any two swapped neighbours (the check symbol)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 2 ** 31 }),
        fc.integer({ min: 0, max: 5 }),
        fc.integer({ min: 1, max: 28 }),
        (seed, pos, shift) => {
          let s = seed;
          const rnd = (k: number) => {
            s = (s * 1103515245 + 12345) % 2 ** 31;
            return s % k;
          };
          const n = newClaimNumber(new Date('2025-06-01T00:00:00Z'), rnd);
          expect(isValidClaimNumber(n)).toBe(true);
          const chars = n.slice(8).replace('-', '').split('');
          const typo = [...chars];
          typo[pos] = CLAIM_NUMBER_ALPHABET[(CLAIM_NUMBER_ALPHABET.indexOf(typo[pos]) + shift) % 29];
          const asNumber = (c: string[]) => `LP-2506-${c.slice(0, 3).join('')}-${c.slice(3).join('')}`;
          expect(isValidClaimNumber(asNumber(typo))).toBe(false);
          if (pos < 5 && chars[pos] !== chars[pos + 1]) {
            const swapped = [...chars];
            [swapped[pos], swapped[pos + 1]] = [swapped[pos + 1], swapped[pos]];
            expect(isValidClaimNumber(asNumber(swapped))).toBe(false);
          }
        },
      ),
    );
  });
});
