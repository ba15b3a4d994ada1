import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { formatMeterNumber, parseMeterNumber } from '../../../shared/claims/meter-number';

const value = (text: string, unit?: Parameters<typeof parseMeterNumber>[1]) => {
  const r = parseMeterNumber(text, unit);
  return r.ok ? r.value : r.message;
};

describe('meter-friendly numbers', () => {
  it('takes a decimal point or a decimal comma, with spaces around', () => {
    expect(value('118.4')).toBe(118.4);
    expect(value(' 118,4 ')).toBe(118.4);
    expect(value(',44')).toBe(0.44);
    expect(value('0.')).toBe(0);
    expect(value('277')).toBe(277);
  });

  it('scales by the unit chosen beside the field: 350 in mA is 0.35 A', () => {
    expect(value('350', 'mA')).toBe(0.35);
    expect(value('0,44', 'A')).toBe(0.44);
    expect(value('37', 'mA')).toBe(0.037);
  });

  it('a unit typed with the number wins over the chosen one, in any case', () => {
    expect(value('350 mA', 'A')).toBe(0.35);
    expect(value('0.35A', 'mA')).toBe(0.35);
    expect(value('48,1 V', 'V')).toBe(48.1);
    expect(value('1.2 kW', 'W')).toBe(1200);
  });

  it('refuses what is not one number, saying what to type', () => {
    expect(value('1,234.5')).toMatch(/is not a number/);
    expect(value('12..4')).toMatch(/is not a number/);
    expect(value('abc')).toMatch(/is not a number/);
    expect(value('350 mV', 'A')).toBe('"mV" is not a unit for this reading (amps).');
    expect(parseMeterNumber('   ')).toEqual({ ok: false, empty: true, message: 'Empty.' });
  });

  it('writes a stored value back in the shown unit, and reads it again to the same value', () => {
    expect(formatMeterNumber(0.35, 'mA')).toBe('350');
    expect(formatMeterNumber(0.44, 'A')).toBe('0.44');
    expect(formatMeterNumber(undefined, 'A')).toBe('');
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 10_000_000 }),
        fc.constantFrom('A', 'mA', 'V') as fc.Arbitrary<'A' | 'mA' | 'V'>,
        (milli, unit) => {
          const v = milli / 1000;
          const back = parseMeterNumber(formatMeterNumber(v, unit), unit);
          return back.ok && Math.abs(back.value - v) < 1e-9;
        },
      ),
    );
  });
});
