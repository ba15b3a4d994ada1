import { describe, expect, it } from 'vitest';

import { evaluationInputSchema, safeEvaluateClaim } from '../../../shared/engine';
import { baseInput, makeInput } from './factory';

const paths = (data: unknown) => {
  const r = evaluationInputSchema.safeParse(data);
  return r.success ? [] : r.error.issues.map((i) => i.path.join('.'));
};

describe('evaluationInputSchema', () => {
  it('accepts the base claim and one without optional parts', () => {
    expect(paths(baseInput())).toEqual([]);
    const { measurements: _m, observations: _o, ...claim } = baseInput().claim;
    expect(paths({ ...baseInput(), claim })).toEqual([]);
  });

  it('refuses unknown keys (strict objects)', () => {
    expect(paths({ ...baseInput(), extra: 1 })).toEqual(['']);
    expect(paths(makeInput({ product: { colour: 'red' } as never }))).toEqual(['product']);
  });

  it('checks the input range, dates, coverage months, strings and dark LEDs across fields', () => {
    expect(paths(makeInput({ product: { inputVoltage: { min: 277, max: 120 } } }))).toEqual([
      'product.inputVoltage.max',
    ]);
    expect(paths(makeInput({ claim: { failedOn: '2023-12-31' } }))).toEqual(['claim.failedOn']);
    expect(paths(makeInput({ claim: { filedOn: '2025-06-09' } }))).toEqual(['claim.filedOn']);
    expect(paths(makeInput({ policy: { fullCoverageMonths: 61 } }))).toEqual(['policy.fullCoverageMonths']);
    const tooMany = Array.from({ length: 13 }, () => ({ amps: 0.036 }));
    expect(paths(makeInput({ claim: { measurements: { strings: tooMany } } }))).toEqual([
      'claim.measurements.strings',
    ]);
    expect(paths(makeInput({ claim: { measurements: { strings: [{ darkLeds: 17 }] } } }))).toEqual([
      'claim.measurements.strings.0.darkLeds',
    ]);
  });

  it('checks formats: dates, money, currency, the nominal voltage, power factor', () => {
    expect(paths(makeInput({ installation: { installedOn: '2024-02-30' } }))).toEqual([
      'installation.installedOn',
    ]);
    expect(paths(makeInput({ installation: { installedOn: '15/01/2024' } }))).toEqual([
      'installation.installedOn',
    ]);
    for (const bad of ['96.001', '-1', '96,00', '1e3', '', '1000000.01']) {
      expect(paths(makeInput({ policy: { unitCredit: bad } }))).toEqual(['policy.unitCredit']);
    }
    expect(paths(makeInput({ policy: { currency: 'usd' } }))).toEqual(['policy.currency']);
    expect(paths(makeInput({ installation: { nominalSupplyVolts: 230 as never } }))).toEqual([
      'installation.nominalSupplyVolts',
    ]);
    expect(paths(makeInput({ claim: { measurements: { powerFactor: 1.2 } } }))).toEqual([
      'claim.measurements.powerFactor',
    ]);
    expect(paths(makeInput({ claim: { symptoms: ['smoke' as never] } }))).toEqual(['claim.symptoms.0']);
  });

  it('safeEvaluateClaim answers the issues by path instead of throwing', () => {
    const r = safeEvaluateClaim({ product: {} });
    expect(r.ok).toBe(false);
    if (!r.ok)
      expect(r.issues.map((i) => i.path)).toEqual(
        expect.arrayContaining(['product.ratedInputWatts', 'policy', 'claim']),
      );
    const ok = safeEvaluateClaim(baseInput());
    expect(ok.ok).toBe(true);
  });
});
