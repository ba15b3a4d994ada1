import { computeValues } from './compute';
import type { RuleContext } from './finding';
import { formatCents } from './money';
import { applicationFindings } from './rules/application';
import { coverageFindings } from './rules/coverage';
import { electricalFindings } from './rules/electrical';
import { evidenceFindings } from './rules/evidence';
import { lifeFindings } from './rules/life';
import {
  evaluationInputSchema,
  type Evaluation,
  type EvaluationInput,
  type Finding,
  type Verdict,
} from './schema';

/** Stored with every evaluation; bump it whenever a rule, threshold or message changes. */
export const ENGINE_VERSION = '1.1.0';

/** Excluded when any finding excludes, else review when any finding asks for one, else covered. */
export function decideVerdict(findings: readonly Finding[]): Verdict {
  let review = false;
  for (let i = 0; i < findings.length; i++) {
    const effect = findings[i].effect;
    if (effect === 'exclude') return 'excluded';
    if (effect === 'review') review = true;
  }
  return review ? 'review' : 'covered';
}

/**
 * Evaluates a claim. The input must already be valid (parse it with `evaluationInputSchema`, or call
 * `safeEvaluateClaim` with unknown data): the engine trusts it and does not validate twice.
 * Pure and deterministic: the same input always gives the same answer.
 */
export function evaluateClaim(input: EvaluationInput): Evaluation {
  const { computed, payableCents, lumen, driverEfficiencyExact } = computeValues(input);
  const ctx: RuleContext = { input, computed, lumen, driverEfficiencyExact };
  const findings: Finding[] = [];
  coverageFindings(ctx, findings);
  applicationFindings(ctx, findings);
  electricalFindings(ctx, findings);
  evidenceFindings(ctx, findings);
  lifeFindings(ctx, findings);
  const verdict = decideVerdict(findings);
  computed.credit = verdict === 'excluded' ? '0.00' : formatCents(payableCents);
  return { engineVersion: ENGINE_VERSION, verdict, findings, computed };
}

export interface InputIssue {
  /** Dotted path of the bad field, e.g. `claim.measurements.strings.0.amps`; empty for the whole input. */
  path: string;
  message: string;
}

export type SafeEvaluation = { ok: true; evaluation: Evaluation } | { ok: false; issues: InputIssue[] };

/** Validates unknown data and evaluates it, or answers each bad field by path. Never throws on bad input. */
export function safeEvaluateClaim(data: unknown): SafeEvaluation {
  const parsed = evaluationInputSchema.safeParse(data);
  if (!parsed.success) {
    return {
      ok: false,
      issues: parsed.error.issues.map((issue) => ({
        path: issue.path.map(String).join('.'),
        message: issue.message,
      })),
    };
  }
  return { ok: true, evaluation: evaluateClaim(parsed.data) };
}

export {
  evaluationInputSchema,
  evaluationSchema,
  findingSchema,
  computedSchema,
  lumenMaintenanceSchema,
  lm80DatasetSchema,
  CATEGORIES,
  SEVERITIES,
  VERDICTS,
  EFFECTS,
  LOCATIONS,
  ENCLOSURES,
  DIMMERS,
  NOMINAL_SUPPLY_VOLTS,
  SYMPTOMS,
} from './schema';
export type {
  Category,
  Computed,
  Effect,
  Evaluation,
  EvaluationInput,
  Finding,
  FindingValues,
  LumenProjection,
  Severity,
  Verdict,
} from './schema';
export { FINDING_CODES, type FindingCode } from './codes';
