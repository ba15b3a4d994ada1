import { describe, expect, it } from 'vitest';

import { num, stringList } from '../../../shared/engine/finding';

describe('message formatting', () => {
  it('prints numbers with at most the given decimals and no trailing zeros', () => {
    expect(num(131)).toBe('131');
    expect(num(19.448)).toBe('19.4');
    expect(num(19.448, 2)).toBe('19.45');
    expect(num(0.036, 3)).toBe('0.036');
    expect(num(0.0305, 3)).toBe('0.031');
    expect(num(4.1, 2)).toBe('4.1');
    expect(num(-2.08, 2)).toBe('-2.08');
    expect(num(0.04, 1)).toBe('0');
    expect(num(82.76, 0)).toBe('83');
    expect(num(1.05, 2)).toBe('1.05');
  });

  it('lists strings by their 1-based number', () => {
    expect(stringList([1])).toBe('2');
    expect(stringList([1, 4])).toBe('2 and 5');
    expect(stringList([0, 1, 6])).toBe('1, 2 and 7');
  });
});
