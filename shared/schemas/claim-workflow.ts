import { z } from 'zod';
import { ACTION_NAMES, type ClaimActionName } from '../claims/stages';
import { addressSchema, DENIAL_CODES, RESOLUTIONS } from '../claims/actions.schema';
import { evaluationSchema, VERDICTS } from '../engine/schema';
import {
  calendarDateSchema,
  currencySchema,
  decimalSchema,
  historyEventSchema,
  idSchema,
  instantSchema,
  orgRefSchema,
} from './answer-parts';
import { CLAIM_STAGES, WAITING_ON } from './claims';

// The answers of the review desk and of GET /api/claims/:id/workflow, as zod (the TS types in
// shared/claims/workflow.ts are z.infer of these). The presenters are server/modules/review/review.presenter.ts
// and server/modules/claim-actions/claim-workflow.presenter.ts.

const personRefSchema = z.object({ id: idSchema, name: z.string() });

/** A claim in the manufacturer's review queue (GET /api/review/queue). */
export const queueItemSchema = z.object({
  id: idSchema,
  number: z.string().nullable(),
  stage: z.enum(CLAIM_STAGES),
  waitingOn: z.enum(WAITING_ON).nullable(),
  contractor: orgRefSchema,
  product: z.object({ id: idSchema, modelNumber: z.string(), name: z.string() }),
  siteName: z.string(),
  units: z.number().int(),
  filedAt: instantSchema.nullable(),
  stageChangedAt: instantSchema,
  /** Whole days since the claim reached its stage. */
  daysInStage: z.number().int().min(0),
  daysSinceFiling: z.number().int().min(0).nullable(),
  verdict: z.enum(VERDICTS).nullable(),
  expectedCredit: decimalSchema.nullable(),
  currency: currencySchema.nullable(),
  assignee: personRefSchema.nullable(),
  version: z.number().int().min(1),
});
export type QueueItemDto = z.infer<typeof queueItemSchema>;

/** The desk's header (GET /api/review/summary): claims per stage, mine, unassigned, the oldest wait. */
export const queueSummarySchema = z.object({
  counts: z.partialRecord(z.enum(CLAIM_STAGES), z.number().int().min(0)),
  mine: z.number().int().min(0),
  unassigned: z.number().int().min(0),
  oldestWaitingDays: z.number().int().min(0).nullable(),
});
export type QueueSummaryDto = z.infer<typeof queueSummarySchema>;

export const claimDocumentSchema = z.object({
  id: idSchema,
  kind: z.enum(['letter', 'packing_slip']),
  filename: z.string(),
  sha256: z.string().regex(/^[0-9a-f]{64}$/),
  byteSize: z.number().int().min(0),
  createdAt: instantSchema,
  url: z.string(),
});
export type ClaimDocumentDto = z.infer<typeof claimDocumentSchema>;

export const claimMessageSchema = z.object({
  id: idSchema,
  kind: z.enum(['info_request', 'info_answer', 'note']),
  body: z.string(),
  /** A person to their own organisation; to the other side, the organisation's name. */
  author: z.object({
    name: z.string(),
    organization: z.string(),
    side: z.enum(['manufacturer', 'contractor']),
  }),
  dueOn: calendarDateSchema.nullable(),
  answeredAt: instantSchema.nullable(),
  createdAt: instantSchema,
  attachments: z.array(
    z.object({
      id: idSchema,
      name: z.string(),
      contentType: z.string(),
      kind: z.string(),
      url: z.string(),
      thumbnailUrl: z.string().nullable(),
    }),
  ),
});
export type ClaimMessageDto = z.infer<typeof claimMessageSchema>;

export const returnAuthorizationSchema = z.object({
  id: idSchema,
  number: z.string(),
  shipTo: addressSchema,
  instructions: z.string().nullable(),
  shipBy: calendarDateSchema,
  carrier: z.string().nullable(),
  trackingNumber: z.string().nullable(),
  shippedOn: calendarDateSchema.nullable(),
  receivedOn: calendarDateSchema.nullable(),
  receivedCondition: z.string().nullable(),
  receivedNote: z.string().nullable(),
  packingSlip: claimDocumentSchema.nullable(),
  createdAt: instantSchema,
});
export type ReturnAuthorizationDto = z.infer<typeof returnAuthorizationSchema>;

export const benchTestSchema = z.object({
  id: idSchema,
  testedOn: calendarDateSchema,
  result: z.string(),
  readings: z.record(z.string(), z.unknown()),
  evaluation: evaluationSchema,
  engineVersion: z.string(),
  note: z.string().nullable(),
  testedBy: z.string(),
  testedAt: instantSchema,
});
export type BenchTestDto = z.infer<typeof benchTestSchema>;

export const decisionSchema = z.object({
  id: idSchema,
  outcome: z.enum(['approved', 'partly_approved', 'denied']),
  resolution: z.enum(RESOLUTIONS).nullable(),
  amount: decimalSchema.nullable(),
  currency: currencySchema.nullable(),
  engineAmount: decimalSchema.nullable(),
  approvedUnits: z.number().int().nullable(),
  reasonCodes: z.array(z.enum(DENIAL_CODES)),
  note: z.string().nullable(),
  overrideReason: z.string().nullable(),
  againstEngine: z.boolean(),
  decidedBy: z.string(),
  decidedAt: instantSchema,
  letter: claimDocumentSchema.nullable(),
});
export type DecisionDto = z.infer<typeof decisionSchema>;

/** GET /api/claims/:id/workflow: what the review screen and the installer's claim page read. */
export const claimWorkflowSchema = z.object({
  claim: z.object({
    id: idSchema,
    number: z.string().nullable(),
    stage: z.enum(CLAIM_STAGES),
    waitingOn: z.enum(WAITING_ON).nullable(),
    version: z.number().int().min(1),
    stageChangedAt: instantSchema,
    assignee: personRefSchema.nullable(),
  }),
  /** What this user can do now, in the stage machine's order. */
  actions: z.array(z.enum(ACTION_NAMES as [ClaimActionName, ...ClaimActionName[]])),
  openRequest: claimMessageSchema.nullable(),
  messages: z.array(claimMessageSchema),
  returns: z.array(returnAuthorizationSchema),
  benchTests: z.array(benchTestSchema),
  decision: decisionSchema.nullable(),
  documents: z.array(claimDocumentSchema),
  history: z.array(historyEventSchema),
});
export type ClaimWorkflowDto = z.infer<typeof claimWorkflowSchema>;
