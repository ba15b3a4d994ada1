import { finding, num, runRules, type Rule, type RuleContext } from '../finding';
import type { Finding } from '../schema';
import { ANSI_C84_1, serviceVoltageRangesFor } from '../voltage-ranges';

// Application: was the product used as rated (location, enclosure, dimmer, supply, ambient)?

export const NEC_LOCATIONS = 'NFPA 70 (NEC) Article 100 and 410.10(A)';

const WETNESS = { dry: 0, damp: 1, wet: 2 } as const;

/** A wet location needs a wet-marked luminaire; a damp one accepts damp or wet (NEC 410.10(A)). */
export const locationRule: Rule = ({ input }) => {
  const installed = input.installation.location;
  const rated = input.product.location;
  if (WETNESS[installed] <= WETNESS[rated]) return null;
  return finding(
    'application.location_wetter_than_rated',
    'application',
    'fail',
    'exclude',
    `Installed in a ${installed} location, but this fixture is rated for ${rated} locations only; a ${installed} location needs a fixture marked suitable for ${installed === 'wet' ? 'wet' : 'damp or wet'} locations.`,
    { installedLocation: installed, ratedLocation: rated },
    NEC_LOCATIONS,
  );
};

/** A lamp without an enclosed rating inside a totally enclosed (unventilated) fixture. */
export const enclosureRule: Rule = ({ input }) => {
  if (input.installation.enclosure !== 'enclosed' || input.product.enclosedRated) return null;
  return finding(
    'application.enclosed_not_rated',
    'application',
    'fail',
    'exclude',
    'Installed in a totally enclosed fixture, but this product is not rated for enclosed use: the trapped heat shortens the life of its driver and LEDs.',
    { enclosure: input.installation.enclosure, enclosedRated: false },
  );
};

/** Any dimmer on a product that is not dimmable. */
export const dimmerRule: Rule = ({ input }) => {
  const dimmer = input.installation.dimmer;
  if (dimmer === 'none' || input.product.dimmable) return null;
  return finding(
    'application.dimmer_on_non_dimmable',
    'application',
    'fail',
    'exclude',
    `A ${dimmer === 'phase' ? 'phase-cut' : '0-10 V'} dimmer is on the circuit, but this product is not dimmable.`,
    { dimmer, dimmable: false },
  );
};

/** The service's nominal voltage outside the product's rated input range. */
export const supplyRatingRule: Rule = ({ input }) => {
  const nominal = input.installation.nominalSupplyVolts;
  const { min, max } = input.product.inputVoltage;
  if (nominal >= min && nominal <= max) return null;
  return finding(
    'application.supply_outside_rating',
    'application',
    'fail',
    'exclude',
    `The service is ${nominal} V nominal; this fixture is rated ${num(min)}-${num(max)} V.`,
    { nominalSupplyVolts: nominal, ratedMinVolts: min, ratedMaxVolts: max },
  );
};

/** Site ambient above the product's rated maximum. */
export const ambientRule: Rule = ({ input }) => {
  const ambient = input.installation.ambientC;
  const rated = input.product.ambientMaxC;
  if (ambient <= rated) return null;
  return finding(
    'application.ambient_above_rating',
    'application',
    'fail',
    'exclude',
    `The site runs at ${num(ambient)} °C; this fixture is rated for ambients up to ${num(rated)} °C.`,
    { ambientC: ambient, ratedAmbientMaxC: rated },
  );
};

/**
 * The supply reading against the ANSI C84.1 service-voltage ranges of the nominal voltage. A product's
 * input rating names nominal services, so a reading inside Range A or B of a rated nominal is ordinary
 * utility variation; outside Range B it is a finding.
 */
export const serviceVoltageRule: Rule = ({ input, computed }) => {
  const volts = input.claim.measurements?.supplyVolts;
  if (volts === undefined) return null;
  const nominal = input.installation.nominalSupplyVolts;
  const ranges = serviceVoltageRangesFor(nominal);
  if (ranges === null) {
    return finding(
      'application.service_voltage_no_range',
      'application',
      'info',
      'none',
      `The supply reads ${num(volts)} V on a ${nominal} V service (this fixture is rated ${num(input.product.inputVoltage.min)}-${num(input.product.inputVoltage.max)} V); no utility voltage range is on file for ${nominal} V, so the reading is not graded.`,
      { supplyVolts: volts, nominalSupplyVolts: nominal },
    );
  }
  const values = {
    supplyVolts: volts,
    nominalSupplyVolts: nominal,
    rangeAMinVolts: ranges.rangeA.min,
    rangeAMaxVolts: ranges.rangeA.max,
    rangeBMinVolts: ranges.rangeB.min,
    rangeBMaxVolts: ranges.rangeB.max,
    ratedMinVolts: input.product.inputVoltage.min,
    ratedMaxVolts: input.product.inputVoltage.max,
  };
  const { min, max } = input.product.inputVoltage;
  const rating = `${num(min)}-${num(max)} V`;
  const a = `${ranges.rangeA.min}-${ranges.rangeA.max} V`;
  const b = `${ranges.rangeB.min}-${ranges.rangeB.max} V`;
  if (computed.serviceVoltageRange === 'A') {
    return finding(
      'application.service_voltage_range_a',
      'application',
      'pass',
      'none',
      `The supply reads ${num(volts)} V, inside ANSI C84.1 Range A (${a}) for a ${nominal} V service.`,
      values,
      ANSI_C84_1,
    );
  }
  if (computed.serviceVoltageRange === 'B') {
    return finding(
      'application.service_voltage_range_b',
      'application',
      'info',
      'none',
      `The supply reads ${num(volts)} V: outside Range A (${a}) but inside Range B (${b}) of ANSI C84.1 for a ${nominal} V service. Range B is tolerated for short periods; if it persists, ask the utility.`,
      values,
      ANSI_C84_1,
    );
  }
  return finding(
    'application.service_voltage_outside',
    'application',
    'warn',
    'none',
    `The supply reads ${num(volts)} V; this fixture is rated ${rating}, and ${num(volts)} V is outside ANSI C84.1 Range B (${b}) for a ${nominal} V service. Have the service checked before replacing the unit.`,
    values,
    ANSI_C84_1,
  );
};

export const applicationExclusionRules: readonly Rule[] = [
  locationRule,
  enclosureRule,
  dimmerRule,
  supplyRatingRule,
  ambientRule,
];
export const applicationSupplyRules: readonly Rule[] = [serviceVoltageRule];

export function applicationFindings(ctx: RuleContext, out: Finding[]): void {
  const before = out.length;
  runRules(applicationExclusionRules, ctx, out);
  if (out.length === before) {
    const { installation, product } = ctx.input;
    out.push(
      finding(
        'application.matches_rating',
        'application',
        'pass',
        'none',
        `Installed as rated: ${installation.location} location, ${installation.enclosure.replace('_', ' and ')} fixture, ${installation.dimmer === 'none' ? 'no dimmer' : 'dimmer on a dimmable product'}, ${installation.nominalSupplyVolts} V service, ${num(installation.ambientC)} °C ambient.`,
        {
          installedLocation: installation.location,
          ratedLocation: product.location,
          enclosure: installation.enclosure,
          dimmer: installation.dimmer,
          nominalSupplyVolts: installation.nominalSupplyVolts,
          ambientC: installation.ambientC,
        },
      ),
    );
  }
  runRules(applicationSupplyRules, ctx, out);
}
