import { daysBetween, wholeMonthsBetween } from './dates';
import { parseCents, scaleCentsHalfUp } from './money';
import { dcPowerWatts, efficiencyRatio, roundTo } from './power';
import type { Computed, EvaluationInput, Lm80Dataset, LumenMaintenanceData, LumenProjection } from './schema';
import {
  arrheniusInterpolate,
  fitLm80,
  projectedFlux,
  projectionLimitHours,
  reportLumenLife,
  type CaseTempFit,
} from './tm21';
import { classifyServiceVoltage } from './voltage-ranges';

export type LumenStatus = 'no_data' | 'insufficient' | 'case_temp_above_tested' | 'projected';

export interface ComputedValues {
  computed: Computed;
  /** Output over input watts, unrounded: the rules judge this; `computed.driverEfficiency` is it rounded. */
  driverEfficiencyExact: number | null;
  /** The credit before the verdict is known (the engine zeroes it when excluded). */
  payableCents: number;
  lumen: LumenStatus;
}

const LUMEN_PERCENTS = [70, 80, 90] as const;

interface DatasetFit extends CaseTempFit {
  testHours: number;
  method: 'fit' | 'given';
}

function fitDataset(d: Lm80Dataset): DatasetFit | null {
  if (d.points !== undefined) {
    const fit = fitLm80(d.points, d.testHours);
    return fit === null
      ? null
      : { B: fit.B, alpha: fit.alpha, caseTempC: d.caseTempC, testHours: fit.testHours, method: 'fit' };
  }
  // Schema guarantees B, alpha and testHours together for a fitted data set.
  const testHours = d.testHours as number;
  if (testHours < 6000) return null;
  return { B: d.B as number, alpha: d.alpha as number, caseTempC: d.caseTempC, testHours, method: 'given' };
}

/** TM-21 projection at the unit's conditions, or why there is none. */
export function projectLumenMaintenance(
  lm: LumenMaintenanceData,
  operatingHours: number,
): { status: LumenStatus; projection: LumenProjection | null } {
  const fits: DatasetFit[] = [];
  for (const d of lm.datasets) {
    const fit = fitDataset(d);
    if (fit === null) return { status: 'insufficient', projection: null };
    fits.push(fit);
  }
  fits.sort((a, b) => a.caseTempC - b.caseTempC);
  const low = fits[0];
  const high = fits[fits.length - 1];
  const target = lm.inServiceCaseTempC;
  let chosen: { B: number; alpha: number };
  let caseTempC: number;
  let method: LumenProjection['method'];
  // The projection limit comes from the test duration of the data the projection rests on: the one data set
  // used, or the shorter of the two when it interpolates between them.
  let testHours: number;
  if (target === undefined || target >= high.caseTempC) {
    if (target !== undefined && target > high.caseTempC)
      return { status: 'case_temp_above_tested', projection: null };
    chosen = high;
    caseTempC = high.caseTempC;
    method = high.method;
    testHours = high.testHours;
  } else if (target <= low.caseTempC) {
    // Below the coolest data set TM-21 does not extrapolate; the coolest data set stands (it is the
    // more pessimistic of the two).
    chosen = low;
    caseTempC = low.caseTempC;
    method = low.method;
    testHours = low.testHours;
  } else {
    // Two data sets around the target. Without decay at both temperatures Arrhenius cannot be applied;
    // fall back to the hotter data set.
    const interpolated = arrheniusInterpolate(low, high, target);
    chosen = interpolated ?? high;
    caseTempC = interpolated === null ? high.caseTempC : target;
    method = interpolated === null ? high.method : 'arrhenius';
    testHours = interpolated === null ? high.testHours : Math.min(low.testHours, high.testHours);
  }
  const limit = projectionLimitHours(testHours, lm.sampleSize);
  const lifetimes = LUMEN_PERCENTS.map((p) => reportLumenLife(chosen, p, limit, testHours));
  return {
    status: 'projected',
    projection: {
      method,
      caseTempC,
      B: chosen.B,
      alpha: chosen.alpha,
      testHours,
      sampleSize: lm.sampleSize,
      projectionLimitHours: limit,
      lifetimes,
      projectedOutputPercent:
        operatingHours <= limit ? roundTo(100 * projectedFlux(chosen, operatingHours), 2) : null,
    },
  };
}

const NO_STRINGS: readonly never[] = [];

export function computeValues(input: EvaluationInput): ComputedValues {
  const { product, policy, installation, claim } = input;
  const m = claim.measurements;

  const serviceVoltageRange =
    m?.supplyVolts === undefined
      ? null
      : classifyServiceVoltage(installation.nominalSupplyVolts, m.supplyVolts);

  let driverOutputWatts: number | null = null;
  let driverEfficiency: number | null = null;
  let driverEfficiencyExact: number | null = null;
  if (m?.driverOutputVolts !== undefined && m.driverOutputAmps !== undefined) {
    const watts = dcPowerWatts(m.driverOutputVolts, m.driverOutputAmps);
    driverOutputWatts = roundTo(watts, 3);
    if (m.inputWatts !== undefined) {
      driverEfficiencyExact = efficiencyRatio(watts, m.inputWatts);
      driverEfficiency = driverEfficiencyExact === null ? null : roundTo(driverEfficiencyExact, 4);
    }
  }
  const inputPowerDeviationPercent =
    m?.inputWatts === undefined
      ? null
      : roundTo(((m.inputWatts - product.ratedInputWatts) / product.ratedInputWatts) * 100, 2);

  // Strings: shorted LEDs from the voltage deficit, open strings from zero current.
  const vf = product.ledForwardVolts;
  const perString = product.ledsPerString;
  const expected = perString * vf;
  const shareAmps = product.driverOutputAmps / product.ledStrings;
  const strings = m?.strings ?? NO_STRINGS;
  const shortedLedsByString: (number | null)[] = new Array(strings.length);
  const currentShareByString: (number | null)[] = new Array(strings.length);
  let darkLeds = 0;
  for (let i = 0; i < strings.length; i++) {
    const s = strings[i];
    currentShareByString[i] = s.amps === undefined ? null : roundTo(s.amps / shareAmps, 2);
    const seenDark = s.darkLeds ?? 0;
    if (s.amps === 0) {
      // An open string carries no current: every LED on it is dark.
      shortedLedsByString[i] = null;
      darkLeds += perString;
      continue;
    }
    let shorted: number | null = null;
    if (s.volts !== undefined) {
      shorted = Math.round((expected - s.volts) / vf);
      if (shorted < 0) shorted = 0;
      else if (shorted > perString) shorted = perString;
    }
    shortedLedsByString[i] = shorted;
    // A shorted LED is a dark LED: count the larger of the two so one LED is not counted twice.
    darkLeds += shorted !== null && shorted > seenDark ? shorted : seenDark;
  }
  const totalLeds = product.ledStrings * perString;
  const darkLedPercent = roundTo((darkLeds / totalLeds) * 100, 2);

  const ageMonths = wholeMonthsBetween(installation.installedOn, claim.failedOn);
  const operatingDays = daysBetween(installation.installedOn, claim.failedOn);
  const operatingHours = roundTo((operatingDays < 0 ? 0 : operatingDays) * installation.hoursPerDay, 2);
  const daysToFiling = daysBetween(claim.failedOn, claim.filedOn);

  // Coverage: 100 % below the full-coverage months, then linear to 0 at the term; credit in integer cents.
  const term = policy.termMonths;
  const full = policy.fullCoverageMonths;
  const grossCents = parseCents(policy.unitCredit) * claim.units;
  let coveragePercent: number;
  let payableCents: number;
  if (ageMonths >= term) {
    coveragePercent = 0;
    payableCents = 0;
  } else if (ageMonths < full) {
    coveragePercent = 100;
    payableCents = grossCents;
  } else {
    coveragePercent = roundTo((100 * (term - ageMonths)) / (term - full), 2);
    payableCents = scaleCentsHalfUp(grossCents, term - ageMonths, term - full);
  }

  const qualifies =
    darkLeds * 100 >= policy.darkLedFailurePercent * totalLeds ||
    claim.symptoms.includes('dark') ||
    claim.symptoms.includes('cycling');

  let lumen: LumenStatus = 'no_data';
  let lumenMaintenance: LumenProjection | null = null;
  if (product.lumenMaintenance !== undefined) {
    const projected = projectLumenMaintenance(product.lumenMaintenance, operatingHours);
    lumen = projected.status;
    lumenMaintenance = projected.projection;
  }

  return {
    payableCents,
    lumen,
    driverEfficiencyExact,
    computed: {
      serviceVoltageRange,
      driverOutputWatts,
      driverEfficiency,
      inputPowerDeviationPercent,
      expectedStringVolts: roundTo(expected, 3),
      shortedLedsByString,
      currentShareByString,
      totalLeds,
      darkLeds,
      darkLedPercent,
      ageMonths,
      operatingHours,
      daysToFiling,
      coveragePercent,
      credit: '0.00',
      currency: policy.currency,
      qualifies,
      lumenMaintenance,
    },
  };
}
