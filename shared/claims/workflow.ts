import { z } from 'zod';
import { str } from '../schemas/text';

import { CLAIM_STAGES, type ClaimStage, type WaitingOn } from '../schemas/claims';
import { listQuerySchema } from '../schemas/users';
import { CLAIM_NUMBER_ALPHABET } from './claim-number';

// The review workflow around the stage machine: who the claim waits on at each stage, the return
// authorisation's number, the deadlines we set, the reviewer's queue query and the answers the screens read.

/** Who must act next at each stage; null once nothing is left to do by either side. */
export const WAITING_ON_BY_STAGE: Record<ClaimStage, WaitingOn | null> = {
  draft: 'contractor',
  filed: 'manufacturer',
  in_review: 'manufacturer',
  needs_info: 'contractor',
  // Until the installer records the shipment; then the manufacturer waits for the box.
  return_requested: 'contractor',
  unit_received: 'manufacturer',
  // The manufacturer's accountant issues the credit.
  approved: 'manufacturer',
  denied: null,
  credited: null,
  closed: null,
  withdrawn: null,
};

/** Days the installer has to answer a question, and to ship a requested unit. Our own service levels. */
export const INFO_RESPONSE_DAYS = 14;
export const RETURN_SHIP_DAYS = 30;

/** Return authorisation numbers: RA-YYMM-XXXXXX, in the claim numbers' alphabet (no look-alikes). */
export const RETURN_NUMBER_PATTERN = /^RA-\d{4}-[2-9A-HJKMNP-TW-Z]{6}$/;

export function newReturnNumber(date: Date, random: (n: number) => number): string {
  const yymm = `${String(date.getUTCFullYear() % 100).padStart(2, '0')}${String(date.getUTCMonth() + 1).padStart(2, '0')}`;
  let body = '';
  for (let i = 0; i < 6; i++) body += CLAIM_NUMBER_ALPHABET[random(CLAIM_NUMBER_ALPHABET.length)];
  return `RA-${yymm}-${body}`;
}

/** YYYY-MM-DD plus whole days (UTC). */
export function addDays(isoDate: string, days: number): string {
  const d = new Date(`${isoDate}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + days);
  return d.toISOString().slice(0, 10);
}

/** Whole days from one instant to another, rounded down (the queue's "days waiting"). */
export function daysBetween(from: string | Date, to: string | Date): number {
  const a = typeof from === 'string' ? Date.parse(from) : from.getTime();
  const b = typeof to === 'string' ? Date.parse(to) : to.getTime();
  return Math.max(0, Math.floor((b - a) / 86_400_000));
}

// The reviewer's queue: the claims list with the reviewer's filters.

const stageList = str()
  .transform((s) =>
    s
      .split(',')
      .map((x) => x.trim())
      .filter(Boolean),
  )
  .pipe(
    z
      .array(z.enum(CLAIM_STAGES, { error: 'Pick a known stage.' }))
      .min(1)
      .max(CLAIM_STAGES.length),
  );

const money = str().regex(/^\d{1,10}(\.\d{1,2})?$/, 'Enter an amount like "96.00".');
const uuid = z.uuid({ error: 'Not a valid id.' });

export const QUEUE_SORTS = [
  'filedAt',
  '-filedAt',
  'stageChangedAt',
  '-stageChangedAt',
  'amount',
  '-amount',
  'number',
  '-number',
] as const;

export const queueQuerySchema = listQuerySchema.extend({
  sort: z.enum(QUEUE_SORTS).default('stageChangedAt'),
  stage: stageList.optional(),
  verdict: z.enum(['covered', 'excluded', 'review']).optional(),
  waitingOn: z.enum(['manufacturer', 'contractor']).optional(),
  /** Days since filing, at least / at most. */
  minAgeDays: z.coerce.number().int().min(0).max(3650).optional(),
  maxAgeDays: z.coerce.number().int().min(0).max(3650).optional(),
  productModelId: uuid.optional(),
  contractorId: uuid.optional(),
  minAmount: money.optional(),
  maxAmount: money.optional(),
  /** `me`: assigned to the signed-in reviewer; `none`: nobody's yet; or a reviewer's id. */
  assignee: z.union([z.literal('me'), z.literal('none'), uuid]).optional(),
});
export type QueueQuery = z.infer<typeof queueQuerySchema>;

/** GET /api/review/contractors: the contractors with claims on this manufacturer, for the queue's picker. */
export const reviewContractorsQuerySchema = z.strictObject({
  q: str().trim().max(120).optional(),
});
export type ReviewContractorsQuery = z.infer<typeof reviewContractorsQuerySchema>;

/** GET /api/review/reviewers: takes no filters; any parameter is refused rather than ignored. */
export const reviewReviewersQuerySchema = z.strictObject({});

/** A name in one of the desk's pickers: a contractor, or a reviewer of the same manufacturer. */
export type DeskOptionDto = { id: string; name: string };

/** The most names a picker answer carries; the contractors' one says when there were more. */
export const DESK_OPTIONS_LIMIT = 500;

export const assignClaimSchema = z.strictObject({
  /** The reviewer to own the claim; null gives it back to the queue. */
  assigneeId: uuid.nullable(),
});
export type AssignClaimInput = z.infer<typeof assignClaimSchema>;

// What the review screen and the installer's claim page read (GET /api/claims/:id/workflow) and the desk's queue:
// zod in shared/schemas/claim-workflow.ts, the types z.infer of them.
export type {
  BenchTestDto,
  ClaimDocumentDto,
  ClaimMessageDto,
  ClaimWorkflowDto,
  DecisionDto,
  QueueItemDto,
  QueueSummaryDto,
  ReturnAuthorizationDto,
} from '../schemas/claim-workflow';

// The conversation's files are attachments (uploaded as multipart through the attachments module). Owner types:
// an upload waiting for the next answer is held against the claim; an answer takes it (owner: the message).
export const CONVERSATION_DRAFT = 'claim_message_draft';
export const CONVERSATION_SENT = 'claim_message';
