import type {
  ClaimEngineContext,
  ClaimFields,
  ClaimMeasurements,
  ClaimObservations,
} from '../schemas/claims';

// The one mapping from a claim and what it hangs on (product ratings, the installation's policy version in
// force, the installation's conditions) to the engine's input (ENGINE.md). The server uses it when filing;
// the claim form uses it for the live evaluation, so both judge the very same input.

export type ProductRatings = {
  ratedInputWatts: number;
  inputVoltsMin: number;
  inputVoltsMax: number;
  ledStrings: number;
  ledsPerString: number;
  ledForwardVolts: number;
  driverOutputAmps: number;
  driverMaxOutputVolts: number | null;
  location: 'dry' | 'damp' | 'wet';
  enclosedRated: boolean;
  dimming: 'none' | 'phase' | '0-10v' | 'phase_or_0-10v';
  ambientMaxC: number;
  ratedLifeHours: number;
};

export type PolicyTermsForEngine = {
  termMonths: number;
  fullCoverageMonths: number;
  filingWindowDays: number;
  darkLedFailurePercent: number | string;
  unitCredit: string;
  currency: string;
  requiredPhotos: number;
  proofOfPurchaseRequired: boolean;
};

export type InstallationForEngine = {
  installDate: string;
  location: 'dry' | 'damp' | 'wet';
  enclosure: 'open' | 'enclosed' | 'enclosed_ventilated';
  dimmer: 'none' | 'phase' | '0-10v';
  nominalSupplyVolts: number;
  hoursPerDay: number;
  ambientC: number;
};

export function engineContextFrom(
  p: ProductRatings,
  v: PolicyTermsForEngine | null,
  i: InstallationForEngine,
): ClaimEngineContext {
  return {
    product: {
      ratedInputWatts: p.ratedInputWatts,
      inputVoltage: { min: p.inputVoltsMin, max: p.inputVoltsMax },
      ledStrings: p.ledStrings,
      ledsPerString: p.ledsPerString,
      ledForwardVolts: p.ledForwardVolts,
      driverOutputAmps: p.driverOutputAmps,
      ...(p.driverMaxOutputVolts != null ? { driverMaxOutputVolts: p.driverMaxOutputVolts } : {}),
      location: p.location,
      enclosedRated: p.enclosedRated,
      // The engine knows only dimmable or not; which kind of dimming is the installation fit check's concern.
      dimmable: p.dimming !== 'none',
      ambientMaxC: p.ambientMaxC,
      ratedLifeHours: p.ratedLifeHours,
    },
    policy: v
      ? {
          termMonths: v.termMonths,
          fullCoverageMonths: v.fullCoverageMonths,
          filingWindowDays: v.filingWindowDays,
          darkLedFailurePercent: Number(v.darkLedFailurePercent),
          unitCredit: v.unitCredit,
          currency: v.currency,
          requiredPhotos: v.requiredPhotos,
          proofOfPurchaseRequired: v.proofOfPurchaseRequired,
        }
      : null,
    installation: {
      installedOn: i.installDate,
      location: i.location,
      enclosure: i.enclosure,
      dimmer: i.dimmer,
      nominalSupplyVolts: i.nominalSupplyVolts as ClaimEngineContext['installation']['nominalSupplyVolts'],
      hoursPerDay: i.hoursPerDay,
      ambientC: i.ambientC,
    },
  };
}

export type ClaimEvidence = { photos: number; proofOfPurchase: boolean };

const defined = <T extends Record<string, unknown>>(o: T) =>
  Object.fromEntries(Object.entries(o).filter(([, v]) => v !== undefined && v !== null)) as Partial<T>;

/**
 * The engine input for a claim (not yet validated: pass it to safeEvaluateClaim, which answers each missing
 * or bad field). `filedOn` is today for the live view, the filing day on the server.
 */
export function engineInputFor(
  ctx: ClaimEngineContext,
  claim: ClaimFields,
  evidence: ClaimEvidence,
  filedOn: string,
): unknown {
  const m: ClaimMeasurements = claim.measurements ?? {};
  const strings = (m.strings ?? []).map((s) =>
    defined({ volts: s.volts, amps: s.amps, darkLeds: s.darkLeds }),
  );
  // Trailing rows left blank are not readings.
  while (strings.length && Object.keys(strings[strings.length - 1]).length === 0) strings.pop();
  const o: ClaimObservations = claim.observations ?? {};
  const serials = claim.serials ?? [];
  return {
    product: ctx.product,
    policy: ctx.policy ?? undefined,
    installation: ctx.installation,
    claim: {
      failedOn: claim.failedOn ?? undefined,
      filedOn,
      units: claim.units ?? (serials.length || 1),
      symptoms: claim.symptoms ?? [],
      measurements: {
        ...defined({
          supplyVolts: m.supplyVolts,
          inputWatts: m.inputWatts,
          powerFactor: m.powerFactor,
          driverOutputVolts: m.driverOutputVolts,
          driverOutputAmps: m.driverOutputAmps,
        }),
        ...(strings.length ? { strings } : {}),
      },
      // Burn marks are recorded for the reviewer; the engine has no rule of its own for them.
      observations: defined({
        debrisIngress: o.debrisIngress,
        waterIngress: o.waterIngress,
        physicalDamage: o.physicalDamage,
        fanStopped: o.fanStopped,
      }),
      evidence: {
        photos: evidence.photos,
        proofOfPurchase: evidence.proofOfPurchase,
        ...(serials[0] ? { serial: serials[0] } : {}),
      },
    },
  };
}
