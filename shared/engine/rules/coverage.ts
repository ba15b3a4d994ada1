import { finding, num, plural, runRules, type Rule, type RuleContext } from '../finding';
import type { Finding } from '../schema';

// Coverage: the warranty term and its proration, the filing window, and whether the failure counts.

/** Age at or past the term excludes; past the full-coverage months the credit is prorated. */
export const termRule: Rule = ({ input, computed }) => {
  const { termMonths, fullCoverageMonths } = input.policy;
  const { ageMonths, coveragePercent } = computed;
  const values = { ageMonths, termMonths, fullCoverageMonths, coveragePercent };
  if (ageMonths >= termMonths) {
    return finding(
      'coverage.past_term',
      'coverage',
      'fail',
      'exclude',
      `The unit failed ${ageMonths} months after it was installed; the warranty term is ${termMonths} months, so it has run out.`,
      values,
    );
  }
  if (ageMonths >= fullCoverageMonths) {
    return finding(
      'coverage.prorated',
      'coverage',
      'info',
      'none',
      `The unit failed ${ageMonths} months after it was installed, past the ${fullCoverageMonths}-month full-coverage period and inside the ${termMonths}-month term: the credit is prorated to ${num(coveragePercent, 2)} %.`,
      values,
    );
  }
  return finding(
    'coverage.full_coverage',
    'coverage',
    'pass',
    'none',
    `The unit failed ${ageMonths} ${plural(ageMonths, 'month', 'months')} after it was installed, inside the ${fullCoverageMonths}-month full-coverage period.`,
    values,
  );
};

/** A claim filed more than the window's days after the failure needs a person. */
export const filingWindowRule: Rule = ({ input, computed }) => {
  const { filingWindowDays } = input.policy;
  const { daysToFiling } = computed;
  const values = { daysToFiling, filingWindowDays };
  if (daysToFiling > filingWindowDays) {
    return finding(
      'coverage.filed_late',
      'coverage',
      'warn',
      'review',
      `The claim was filed ${daysToFiling} days after the failure; the policy asks for claims within ${filingWindowDays} days.`,
      values,
    );
  }
  return finding(
    'coverage.filed_in_window',
    'coverage',
    'pass',
    'none',
    `Filed ${daysToFiling} ${plural(daysToFiling, 'day', 'days')} after the failure, inside the ${filingWindowDays}-day filing window.`,
    values,
  );
};

/** The failure counts when enough LEDs are dark, or the unit is dark or cycling. */
export const qualificationRule: Rule = ({ input, computed }) => {
  const { darkLedFailurePercent } = input.policy;
  const { darkLeds, darkLedPercent, totalLeds, qualifies } = computed;
  const symptoms = input.claim.symptoms;
  const dark = symptoms.includes('dark');
  const cycling = symptoms.includes('cycling');
  const values = {
    darkLeds,
    totalLeds,
    darkLedPercent,
    darkLedFailurePercent,
    symptomDark: dark,
    symptomCycling: cycling,
  };
  if (qualifies) {
    const reason =
      darkLeds * 100 >= darkLedFailurePercent * totalLeds
        ? `${darkLeds} of ${totalLeds} LEDs are dark (${num(darkLedPercent, 2)} %), at or above the policy's ${num(darkLedFailurePercent, 2)} %`
        : dark
          ? 'the unit is reported dark'
          : 'the unit is reported cycling on and off';
    return finding(
      'coverage.failure_qualifies',
      'coverage',
      'pass',
      'none',
      `This counts as a failure under the policy: ${reason}.`,
      values,
    );
  }
  return finding(
    'coverage.failure_not_qualified',
    'coverage',
    'warn',
    'review',
    `Not yet a failure under the policy: ${darkLeds} of ${totalLeds} LEDs are dark (${num(darkLedPercent, 2)} %, the policy needs ${num(darkLedFailurePercent, 2)} %) and the unit is not reported dark or cycling. A reviewer will look at it.`,
    values,
  );
};

export const coverageRules: readonly Rule[] = [termRule, filingWindowRule, qualificationRule];

export function coverageFindings(ctx: RuleContext, out: Finding[]): void {
  runRules(coverageRules, ctx, out);
}
