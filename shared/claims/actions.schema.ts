import { z } from 'zod';
import { str } from '../schemas/text';

import { MONEY_PATTERN } from '../engine/money';
import { measurementsSchema } from '../engine/schema';

// One zod schema per stage action's payload: the screens' forms and the server's routes both validate with
// these. Strict objects: unknown keys are refused. Money is a decimal string, dates are YYYY-MM-DD.

export const RESOLUTIONS = ['replace', 'credit', 'repair_allowance'] as const;
export type Resolution = (typeof RESOLUTIONS)[number];

export const RESOLUTION_LABELS: Record<Resolution, string> = {
  replace: 'Replacement unit',
  credit: 'Credit to account',
  repair_allowance: 'Field-repair allowance',
};

/** Why a claim is denied; stable codes, stored with the decision and counted by analytics. */
export const DENIAL_CODES = [
  'past_term',
  'filed_late',
  'not_a_qualifying_failure',
  'wrong_location',
  'enclosed_not_rated',
  'dimmer_not_supported',
  'supply_outside_rating',
  'ambient_above_rating',
  'physical_damage',
  'ingress',
  'no_fault_found',
  'evidence_missing',
  'duplicate_claim',
  'field_modified',
  'other',
] as const;
export type DenialCode = (typeof DENIAL_CODES)[number];

export const DENIAL_CODE_LABELS: Record<DenialCode, string> = {
  past_term: 'The warranty term had ended',
  filed_late: 'Filed after the filing window closed',
  not_a_qualifying_failure: 'The failure does not meet the policy’s definition',
  wrong_location: 'Installed in a location wetter than the fixture’s rating',
  enclosed_not_rated: 'Used in a totally enclosed fixture without that rating',
  dimmer_not_supported: 'Dimmed although the product is not dimmable',
  supply_outside_rating: 'Supply voltage outside the rated input range',
  ambient_above_rating: 'Ambient temperature above the rated maximum',
  physical_damage: 'Physical damage',
  ingress: 'Water, debris or insect ingress',
  no_fault_found: 'No fault found on the bench',
  evidence_missing: 'Required evidence was not provided',
  duplicate_claim: 'The same unit was already claimed',
  field_modified: 'The unit was modified in the field',
  other: 'Another reason, given in the note',
};

export const BENCH_RESULTS = [
  'failure_confirmed',
  'no_fault_found',
  'damage_found',
  'misapplication_found',
] as const;
export type BenchResult = (typeof BENCH_RESULTS)[number];

export const BENCH_RESULT_LABELS: Record<BenchResult, string> = {
  failure_confirmed: 'Failure confirmed',
  no_fault_found: 'No fault found',
  damage_found: 'Damage found',
  misapplication_found: 'Misapplication found (installed or used outside its rating)',
};

/**
 * The denial reason a bench result points to, pre-chosen on the deny form (the reviewer can change it); none for
 * a confirmed failure.
 */
export const BENCH_DENIAL_CODE: Record<BenchResult, DenialCode | null> = {
  failure_confirmed: null,
  no_fault_found: 'no_fault_found',
  damage_found: 'physical_damage',
  misapplication_found: null, // which rating was exceeded decides the reason: the reviewer picks it
};

export const RECEIPT_CONDITIONS = ['as_described', 'damaged_in_transit', 'incomplete', 'other'] as const;
export type ReceiptCondition = (typeof RECEIPT_CONDITIONS)[number];

export const RECEIPT_CONDITION_LABELS: Record<ReceiptCondition, string> = {
  as_described: 'As described by the installer',
  damaged_in_transit: 'Damaged in transit',
  incomplete: 'Incomplete (parts missing)',
  other: 'Other (say what in the note)',
};

const isoDate = z.iso.date({ error: 'Enter a date as YYYY-MM-DD.' });
const id = str().trim().min(1).max(64);

/** Free text a person writes: trimmed, not empty, bounded. */
export const text = (empty: string, max = 4000) =>
  str({ error: empty }).trim().min(1, empty).max(max, `At most ${max} characters.`);

/** A positive amount as a decimal string with at most two decimals ("96.00"), at most 1,000,000.00. */
export const moneySchema = str({ error: 'Enter an amount like "96.00".' }).superRefine((s, ctx) => {
  if (!MONEY_PATTERN.test(s)) ctx.addIssue({ code: 'custom', message: 'Enter an amount like "96.00".' });
  else if (Number(s) <= 0) ctx.addIssue({ code: 'custom', message: 'The amount must be above zero.' });
  else if (Number(s) > 1_000_000) ctx.addIssue({ code: 'custom', message: 'At most 1000000.00.' });
});

export const addressSchema = z.strictObject({
  name: text('Enter who receives the unit.', 160),
  attention: str().trim().max(160).optional(),
  line1: text('Enter the street address.', 200),
  line2: str().trim().max(200).optional(),
  city: text('Enter the city.', 120),
  region: str().trim().max(120).optional(),
  postalCode: text('Enter the postal code.', 20),
  country: str().regex(/^[A-Z]{2}$/, 'Use a two-letter country code like "US".'),
});
export type Address = z.infer<typeof addressSchema>;

export const fileClaimSchema = z.strictObject({});

export const startReviewSchema = z.strictObject({
  /** The reviewer who will own the claim; the one taking it when left out. */
  assigneeId: id.optional(),
});

export const requestInfoSchema = z.strictObject({
  message: text('Write what you need from the installer.'),
});

export const answerInfoSchema = z.strictObject({
  message: text('Write your answer.'),
  attachmentIds: z.array(id).max(20, 'At most 20 files per answer.').optional(),
});

export const requestReturnSchema = z.strictObject({
  shipTo: addressSchema,
  instructions: str().trim().max(2000).optional(),
});

export const recordShipmentSchema = z.strictObject({
  carrier: text('Enter the carrier.', 80),
  trackingNumber: str({ error: 'Enter the tracking number.' })
    .trim()
    .regex(
      /^[A-Za-z0-9][A-Za-z0-9 -]{2,63}$/,
      'Enter the tracking number (letters, digits, spaces, dashes).',
    ),
  shippedOn: isoDate,
});

export const receiveUnitSchema = z.strictObject({
  receivedOn: isoDate,
  condition: z.enum(RECEIPT_CONDITIONS),
  note: str().trim().max(2000).optional(),
});

export const recordBenchTestSchema = z
  .strictObject({
    testedOn: isoDate,
    result: z.enum(BENCH_RESULTS),
    readings: measurementsSchema,
    note: str().trim().max(4000).optional(),
    /** `decide`: the claim stays with its unit received, ready for a decision; `review`: back to in review. */
    next: z.enum(['decide', 'review']).default('decide'),
  })
  .superRefine((p, ctx) => {
    // A key left undefined (a blank field on the form) is no reading.
    if (Object.values(p.readings).every((v) => v === undefined)) {
      ctx.addIssue({ code: 'custom', path: ['readings'], message: 'Record at least one bench reading.' });
    }
  });

export const approveSchema = z.strictObject({
  resolution: z.enum(RESOLUTIONS, { error: 'Choose replace, credit or repair allowance.' }),
  amount: moneySchema,
  /** Units approved when fewer than the claim's units (a partial approval). */
  approvedUnits: z.number().int().min(1).max(10_000).optional(),
  note: str().trim().max(4000).optional(),
  /** Required when the amount differs from the engine's credit or the engine's verdict was not covered. */
  overrideReason: str().trim().max(4000).optional(),
});

export const denySchema = z.strictObject({
  reasonCodes: z
    .array(z.enum(DENIAL_CODES), { error: 'Choose at least one reason.' })
    .min(1, 'Choose at least one reason.')
    .max(DENIAL_CODES.length)
    .refine((c) => new Set(c).size === c.length, 'Each reason once.'),
  note: text('Write a note the installer will read.'),
  /** Required when the engine's verdict was covered. */
  overrideReason: str().trim().max(4000).optional(),
});

export const creditSchema = z.strictObject({});

export const voidCreditSchema = z.strictObject({
  reason: text('Give the reason for voiding the credit.'),
});

export const closeSchema = z.strictObject({
  note: str().trim().max(2000).optional(),
});

export const withdrawSchema = z.strictObject({
  reason: str().trim().max(2000).optional(),
});

export const reopenSchema = z.strictObject({
  reason: text('Give the reason for reopening the decision.'),
});

export type ApprovePayload = z.infer<typeof approveSchema>;
export type DenyPayload = z.infer<typeof denySchema>;
export type RecordBenchTestPayload = z.infer<typeof recordBenchTestSchema>;
export type ReceiveUnitPayload = z.infer<typeof receiveUnitSchema>;
