// What counts as a failure in the life data and the failure analysis: a "covered claim". Defined once here;
// the server builds its SQL from these lists (server/modules/analytics/analytics.sql.ts) and a test checks the
// two agree on every stage x verdict.
//
// A covered claim is a claim of the manufacturer that
//   - was approved: stage approved or credited (the reviewer's decision stands, whatever the engine said);
//   - was closed after an approval: stage closed with the engine's verdict 'covered' (until the review
//     branch's decision record lands, the verdict stands in for "closed after approval": a claim is closed
//     from denied or credited, and a denied claim with a 'covered' verdict is the rare overruled case);
//   - or, before any decision, was filed and the engine's verdict is 'covered' (filed, in review, needs
//     information, return requested, unit received).
// Drafts, withdrawn and denied claims, and pending claims the engine excluded or sent to review, are not.

import { z } from 'zod';

import { CLAIM_STAGES, type ClaimStage } from '../schemas/claims';
import { check } from './validation';

export type ClaimVerdict = 'covered' | 'excluded' | 'review';

/** Decided for the contractor: covered whatever the verdict. */
export const APPROVED_STAGES = ['approved', 'credited'] as const satisfies readonly ClaimStage[];
/** Covered when the engine's verdict is 'covered'. */
export const COVERED_IF_VERDICT_STAGES = [
  'filed',
  'in_review',
  'needs_info',
  'return_requested',
  'unit_received',
  'closed',
] as const satisfies readonly ClaimStage[];

const claimSchema = z.object({
  stage: z.enum(CLAIM_STAGES),
  verdict: z.enum(['covered', 'excluded', 'review']).nullable(),
});

export function isCoveredClaim(claim: { stage: ClaimStage; verdict: ClaimVerdict | null }): boolean {
  check('isCoveredClaim', claimSchema, claim, 'claim');
  if ((APPROVED_STAGES as readonly ClaimStage[]).includes(claim.stage)) return true;
  return (
    (COVERED_IF_VERDICT_STAGES as readonly ClaimStage[]).includes(claim.stage) && claim.verdict === 'covered'
  );
}
