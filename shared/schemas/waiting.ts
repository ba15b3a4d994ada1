import { z } from 'zod';
import { idSchema, instantSchema } from './answer-parts';

// "What waits on me": the things that need the signed-in person now, derived from the claims themselves (so a
// list can never disagree with the claim), each with the place to act. Read or not is kept per person.

export const WAITING_KINDS = ['info_requested', 'assigned_to_review', 'memo_due', 'return_overdue'] as const;
export type WaitingKind = (typeof WAITING_KINDS)[number];

/** A return shipped this many days ago and still not received is overdue for the reviewers. */
export const RETURN_OVERDUE_DAYS = 10;

export const waitingItemSchema = z.object({
  /** Stable while nothing changes; a new event on the same claim is a new key (and unread again). */
  key: z.string(),
  kind: z.enum(WAITING_KINDS),
  claimId: idSchema,
  claimNumber: z.string(),
  siteName: z.string(),
  /** Since when it has waited (ISO instant). */
  since: instantSchema,
  /** Where to act (a path in the app). */
  link: z.string(),
  read: z.boolean(),
});
export type WaitingItemDto = z.infer<typeof waitingItemSchema>;

export const waitingListSchema = z.object({
  items: z.array(waitingItemSchema),
  unread: z.number().int().min(0),
});
export type WaitingListDto = z.infer<typeof waitingListSchema>;

export const markWaitingReadSchema = z.strictObject({
  keys: z.array(z.string().min(1).max(120)).min(1, 'Name at least one item.').max(200),
});
export type MarkWaitingReadInput = z.infer<typeof markWaitingReadSchema>;

export const WAITING_TEXT: Record<WaitingKind, string> = {
  info_requested: 'The manufacturer asks you for more information',
  assigned_to_review: 'A claim is on your desk to review',
  memo_due: 'An approved claim waits for its credit memo',
  return_overdue: `A returned unit shipped over ${RETURN_OVERDUE_DAYS} days ago has not been marked received`,
};

/** How a person hears about what waits on them by e-mail: each new item at once, one summary a day, or not. */
export const WAITING_MAIL_MODES = ['immediate', 'daily', 'none'] as const;
export type WaitingMailMode = (typeof WAITING_MAIL_MODES)[number];
export const DEFAULT_WAITING_MAIL_MODE: WaitingMailMode = 'daily';

export const waitingMailSchema = z.strictObject({
  mode: z.enum(WAITING_MAIL_MODES, { error: 'Pick at once, a daily summary or never.' }),
});
