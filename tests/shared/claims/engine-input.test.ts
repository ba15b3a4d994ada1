import { describe, expect, it } from 'vitest';
import { engineContextFrom, engineInputFor } from '../../../shared/claims/engine-input';
import { evaluationInputSchema, safeEvaluateClaim } from '../../../shared/engine';

const product = {
  ratedInputWatts: 24,
  inputVoltsMin: 120,
  inputVoltsMax: 277,
  ledStrings: 12,
  ledsPerString: 16,
  ledForwardVolts: 3.0,
  driverOutputAmps: 0.44,
  driverMaxOutputVolts: null,
  location: 'damp' as const,
  enclosedRated: false,
  dimming: 'none' as const,
  ambientMaxC: 45,
  ratedLifeHours: 50000,
};
const policy = {
  termMonths: 60,
  fullCoverageMonths: 36,
  filingWindowDays: 90,
  darkLedFailurePercent: '10.00',
  unitCredit: '96.00',
  currency: 'USD',
  requiredPhotos: 2,
  proofOfPurchaseRequired: true,
};
const installation = {
  installDate: '2024-01-15',
  location: 'dry' as const,
  enclosure: 'open' as const,
  dimmer: 'none' as const,
  nominalSupplyVolts: 120,
  hoursPerDay: 12,
  ambientC: 30,
};

describe('one mapping from a claim to the engine input', () => {
  it('maps the catalogue records to the ENGINE.md shape', () => {
    const ctx = engineContextFrom(product, policy, installation);
    expect(ctx.product).toEqual({
      ratedInputWatts: 24,
      inputVoltage: { min: 120, max: 277 },
      ledStrings: 12,
      ledsPerString: 16,
      ledForwardVolts: 3,
      driverOutputAmps: 0.44,
      location: 'damp',
      enclosedRated: false,
      dimmable: false,
      ambientMaxC: 45,
      ratedLifeHours: 50000,
    });
    expect(ctx.policy!.darkLedFailurePercent).toBe(10);
    expect(ctx.installation.installedOn).toBe('2024-01-15');
  });

  it('gives a valid engine input for a complete claim, dropping blank trailing string rows and burn marks', () => {
    const ctx = engineContextFrom(product, policy, installation);
    const input = engineInputFor(
      ctx,
      {
        serials: ['AC-2401-00017'],
        failedOn: '2025-06-10',
        symptoms: ['partly_dark'],
        measurements: {
          supplyVolts: 118,
          strings: [{ volts: 45, amps: 0.037, darkLeds: 1 }, {}, { amps: 0 }, {}, {}],
        },
        observations: { burnMarks: true, waterIngress: false },
        narrative: 'East row dark',
      },
      { photos: 3, proofOfPurchase: true },
      '2025-06-20',
    );
    const parsed = evaluationInputSchema.safeParse(input);
    expect(parsed.success).toBe(true);
    const claim = parsed.data!.claim;
    expect(claim.units).toBe(1);
    expect(claim.measurements!.strings).toEqual([{ volts: 45, amps: 0.037, darkLeds: 1 }, {}, { amps: 0 }]);
    expect(claim.observations).toEqual({ waterIngress: false });
    expect(claim.evidence).toEqual({ photos: 3, proofOfPurchase: true, serial: 'AC-2401-00017' });
    // ENGINE.md: an open string (current 0) counts all its LEDs dark: 16 + 1 = 17 of 192.
    const r = safeEvaluateClaim(input);
    expect(r.ok && r.evaluation.computed.darkLeds).toBe(17);
  });

  it('an incomplete claim is an engine input the engine refuses by field, not a crash', () => {
    const ctx = engineContextFrom(product, null, installation);
    const r = safeEvaluateClaim(engineInputFor(ctx, {}, { photos: 0, proofOfPurchase: false }, '2025-06-20'));
    expect(r.ok).toBe(false);
    if (!r.ok)
      expect(r.issues.map((i) => i.path)).toEqual(expect.arrayContaining(['policy', 'claim.failedOn']));
  });
});
