import { finding, num, runRules, type Rule, type RuleContext } from '../finding';
import type { Finding } from '../schema';
import { IES_TM21, formatHours } from '../tm21';

// Life: hours of use against rated life, and measured light output against the TM-21 projection.

export const ratedLifeRule: Rule = ({ input, computed }) => {
  const hours = computed.operatingHours;
  const rated = input.product.ratedLifeHours;
  const values = {
    operatingHours: hours,
    ratedLifeHours: rated,
    hoursPerDay: input.installation.hoursPerDay,
  };
  if (hours >= rated) {
    return finding(
      'life.past_rated_life',
      'life',
      'warn',
      'review',
      `About ${formatHours(hours)} hours of use (${num(input.installation.hoursPerDay)} h a day): at or past the ${formatHours(rated)}-hour rated life, where wear-out is expected.`,
      values,
    );
  }
  return finding(
    'life.within_rated_life',
    'life',
    'pass',
    'none',
    `About ${formatHours(hours)} hours of use (${num(input.installation.hoursPerDay)} h a day), inside the ${formatHours(rated)}-hour rated life.`,
    values,
  );
};

export const lumenDataRule: Rule = ({ lumen, input }) => {
  const lm = input.product.lumenMaintenance;
  if (lm === undefined) return null;
  if (lumen === 'insufficient') {
    return finding(
      'life.lm80_data_insufficient',
      'life',
      'info',
      'none',
      'The lumen-maintenance data cover less than 6,000 hours of testing (or too few points in the fitting window), so no TM-21 projection can be made.',
      { datasets: lm.datasets.length },
      IES_TM21,
    );
  }
  if (lumen === 'case_temp_above_tested') {
    let hottest = -Infinity;
    for (const d of lm.datasets) if (d.caseTempC > hottest) hottest = d.caseTempC;
    return finding(
      'life.case_temp_above_tested',
      'life',
      'info',
      'none',
      `The LEDs run at ${num(lm.inServiceCaseTempC ?? 0)} °C in service, hotter than any tested case temperature (${num(hottest)} °C): TM-21 does not project beyond the tested temperatures.`,
      { inServiceCaseTempC: lm.inServiceCaseTempC ?? null, hottestTestedCaseTempC: hottest },
      IES_TM21,
    );
  }
  return null;
};

/** Measured light output against the projection at the unit's operating hours. */
export const lumenProjectionRule: Rule = ({ input, computed }) => {
  const projection = computed.lumenMaintenance;
  const measured = input.claim.measurements?.lightOutputPercent;
  if (projection === null || measured === undefined) return null;
  const hours = computed.operatingHours;
  const l70 = projection.lifetimes[0];
  const values = {
    lightOutputPercent: measured,
    projectedOutputPercent: projection.projectedOutputPercent,
    operatingHours: hours,
    projectionLimitHours: projection.projectionLimitHours,
    caseTempC: projection.caseTempC,
    B: projection.B,
    alpha: projection.alpha,
    l70Reported: l70.reported,
  };
  const projected = projection.projectedOutputPercent;
  if (projected === null) {
    return finding(
      'life.beyond_projection_limit',
      'life',
      'info',
      'none',
      `The unit has run about ${formatHours(hours)} hours, past the ${formatHours(projection.projectionLimitHours)} hours TM-21 allows this data to be projected, so its ${num(measured)} % light output cannot be judged against a projection.`,
      values,
      IES_TM21,
    );
  }
  if (measured < projected) {
    return finding(
      'life.output_below_projection',
      'life',
      'warn',
      'none',
      `Measured light output is ${num(measured)} % of initial; at about ${formatHours(hours)} hours the LEDs' TM-21 projection is ${num(projected)} %. The unit is dimmer than its LEDs should be: look at heat, drive current and the optics.`,
      values,
      IES_TM21,
    );
  }
  return finding(
    'life.output_within_projection',
    'life',
    'pass',
    'none',
    `Measured light output is ${num(measured)} % of initial, at or above the ${num(projected)} % the TM-21 projection gives at about ${formatHours(hours)} hours.`,
    values,
    IES_TM21,
  );
};

export const lifeRules: readonly Rule[] = [ratedLifeRule, lumenDataRule, lumenProjectionRule];

export function lifeFindings(ctx: RuleContext, out: Finding[]): void {
  runRules(lifeRules, ctx, out);
}
