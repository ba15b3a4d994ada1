import type { EvaluationInput } from '../../../shared/engine';

// A valid claim the tests change one field at a time. Every number here is invented for the tests.
export function baseInput(): EvaluationInput {
  return {
    product: {
      ratedInputWatts: 24,
      inputVoltage: { min: 120, max: 277 },
      ledStrings: 12,
      ledsPerString: 16,
      ledForwardVolts: 3.0,
      driverOutputAmps: 0.44,
      driverMaxOutputVolts: 56,
      location: 'damp',
      enclosedRated: true,
      dimmable: false,
      ambientMaxC: 45,
      ratedLifeHours: 50000,
    },
    policy: {
      termMonths: 60,
      fullCoverageMonths: 36,
      filingWindowDays: 90,
      darkLedFailurePercent: 10,
      unitCredit: '96.00',
      currency: 'USD',
      requiredPhotos: 2,
      proofOfPurchaseRequired: true,
    },
    installation: {
      installedOn: '2024-01-15',
      location: 'dry',
      enclosure: 'open',
      dimmer: 'none',
      nominalSupplyVolts: 120,
      hoursPerDay: 12,
      ambientC: 30,
    },
    claim: {
      failedOn: '2025-06-10',
      filedOn: '2025-06-20',
      units: 2,
      symptoms: ['dark'],
      measurements: {
        supplyVolts: 118,
        inputWatts: 23.5,
        powerFactor: 0.93,
        driverOutputVolts: 44.2,
        driverOutputAmps: 0.44,
      },
      observations: { debrisIngress: false, waterIngress: false, physicalDamage: false, fanStopped: false },
      evidence: { photos: 3, proofOfPurchase: true, serial: 'AC-2401-00017' },
    },
  };
}

type DeepPartial<T> = T extends readonly unknown[]
  ? T
  : T extends object
    ? { [K in keyof T]?: DeepPartial<T[K]> }
    : T;

function merge(target: Record<string, unknown>, patch: Record<string, unknown>): void {
  for (const [key, value] of Object.entries(patch)) {
    const current = target[key];
    if (
      value !== null &&
      typeof value === 'object' &&
      !Array.isArray(value) &&
      current !== null &&
      typeof current === 'object' &&
      !Array.isArray(current)
    ) {
      merge(current as Record<string, unknown>, value as Record<string, unknown>);
    } else {
      target[key] = value;
    }
  }
}

/** The base claim with a deep patch applied (arrays are replaced, not merged). */
export function makeInput(patch: DeepPartial<EvaluationInput> = {}): EvaluationInput {
  const input = baseInput();
  merge(input as unknown as Record<string, unknown>, patch as Record<string, unknown>);
  return input;
}
