import { z } from 'zod';

// Ageing for a manufacturer's administrators: open claims by stage and by how long they have waited in it, per
// reviewer, against a target per stage the organisation sets.

export const AGEING_STAGES = [
  'filed',
  'in_review',
  'needs_info',
  'return_requested',
  'unit_received',
  'approved',
] as const;
export type AgeingStage = (typeof AGEING_STAGES)[number];

/** Whole days waited: 0-7, 8-14, 15-30, over 30 (issue 18). */
export const AGEING_BUCKETS = ['0-7', '8-14', '15-30', '>30'] as const;
export type AgeingBucket = (typeof AGEING_BUCKETS)[number];

export function bucketOf(days: number): AgeingBucket {
  if (days <= 7) return '0-7';
  if (days <= 14) return '8-14';
  if (days <= 30) return '15-30';
  return '>30';
}

export const stageTargetsSchema = z.strictObject(
  Object.fromEntries(
    AGEING_STAGES.map((s) => [
      s,
      z.number().int('Whole days.').min(1, 'At least 1 day.').max(365, 'At most 365 days.').optional(),
    ]),
  ) as Record<AgeingStage, z.ZodOptional<z.ZodNumber>>,
);
export type StageTargets = z.infer<typeof stageTargetsSchema>;
export const updateStageTargetsSchema = z.strictObject({ targets: stageTargetsSchema });

const ageingCountsSchema = z.object(
  Object.fromEntries(AGEING_BUCKETS.map((b) => [b, z.number().int().min(0)])) as Record<
    AgeingBucket,
    z.ZodNumber
  >,
);
const ageingRowShape = {
  counts: ageingCountsSchema,
  total: z.number().int().min(0),
  overTarget: z.number().int().min(0),
};
export const ageingRowSchema = z.object(ageingRowShape);
export type AgeingRowDto = z.infer<typeof ageingRowSchema>;

export const ageingClaimSchema = z.object({
  id: z.uuid(),
  number: z.string(),
  stage: z.enum(AGEING_STAGES),
  days: z.number().int().min(0),
  reviewer: z.string().nullable(),
  overTarget: z.boolean(),
});
export type AgeingClaimDto = z.infer<typeof ageingClaimSchema>;

/** The ageing view (ageing.service.ts): counts per stage and per reviewer by age bucket, and the overdue claims. */
export const ageingSchema = z.object({
  targets: stageTargetsSchema,
  byStage: z.array(
    z.object({ stage: z.enum(AGEING_STAGES), target: z.number().int().nullable(), ...ageingRowShape }),
  ),
  byReviewer: z.array(z.object({ reviewerId: z.uuid().nullable(), reviewer: z.string(), ...ageingRowShape })),
  /** The claims past their stage's target, longest first. */
  overdue: z.array(ageingClaimSchema),
});
export type AgeingDto = z.infer<typeof ageingSchema>;
