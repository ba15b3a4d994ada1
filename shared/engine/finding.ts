import type { Category, Computed, Effect, EvaluationInput, Finding, FindingValues, Severity } from './schema';
import type { LumenStatus } from './compute';

/** What every rule sees: the validated input and the values computed once from it. */
export interface RuleContext {
  input: EvaluationInput;
  computed: Computed;
  lumen: LumenStatus;
  /** Driver output / input watts before rounding: judged here, shown rounded in `computed`. */
  driverEfficiencyExact: number | null;
}

/** A rule checks one thing and answers one finding, or null when it has nothing to say. */
export type Rule = (ctx: RuleContext) => Finding | null;

export function finding(
  code: string,
  category: Category,
  severity: Severity,
  effect: Effect,
  message: string,
  values: FindingValues,
  reference?: string,
): Finding {
  return reference === undefined
    ? { code, category, severity, effect, message, values }
    : { code, category, severity, effect, message, reference, values };
}

/** Runs the rules in order and appends what they find. */
export function runRules(rules: readonly Rule[], ctx: RuleContext, out: Finding[]): void {
  for (let i = 0; i < rules.length; i++) {
    const f = rules[i](ctx);
    if (f !== null) out.push(f);
  }
}

/** A number for a message: at most `places` decimals, no trailing zeros ("131", "19.4"). */
export function num(value: number, places = 1): string {
  // Integer arithmetic, not toFixed or String(float): this runs a dozen times per evaluation and
  // floating-point printing is the slowest thing in it.
  const f = places === 0 ? 1 : places === 1 ? 10 : places === 2 ? 100 : 10 ** places;
  let r = Math.round(value * f);
  if (!Number.isFinite(r)) return String(value);
  if (r === 0) return '0';
  const negative = r < 0;
  if (negative) r = -r;
  const whole = Math.floor(r / f);
  let fraction = r - whole * f;
  let out = String(whole);
  if (fraction !== 0) {
    let digits = places;
    while (fraction % 10 === 0) {
      fraction /= 10;
      digits--;
    }
    out += `.${String(fraction).padStart(digits, '0')}`;
  }
  return negative ? `-${out}` : out;
}

/** 1-based string numbers for a message: "2", "2 and 5", "2, 5 and 7". */
export function stringList(indexes: readonly number[]): string {
  const names = indexes.map((i) => String(i + 1));
  if (names.length <= 1) return names.join('');
  return `${names.slice(0, -1).join(', ')} and ${names[names.length - 1]}`;
}

export function plural(n: number, one: string, many: string): string {
  return n === 1 ? one : many;
}
