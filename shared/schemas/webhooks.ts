import { z } from 'zod';
import {
  calendarDateSchema,
  currencySchema,
  decimalSchema,
  idSchema,
  instantSchema,
  orgRefSchema,
} from './answer-parts';

// The events an organisation's endpoints may ask for. Names are part of the interface: never rename one.
export const WEBHOOK_EVENTS = [
  'claim.filed',
  'claim.information_requested',
  'claim.return_authorised',
  'claim.decided',
  'claim.credited',
  'credit_memo.voided',
] as const;
export type WebhookEvent = (typeof WEBHOOK_EVENTS)[number];

export const WEBHOOK_EVENT_LABELS: Record<WebhookEvent, string> = {
  'claim.filed': 'Claim filed',
  'claim.information_requested': 'Information requested',
  'claim.return_authorised': 'Return authorised',
  'claim.decided': 'Claim decided',
  'claim.credited': 'Claim credited',
  'credit_memo.voided': 'Credit memo voided',
};

/** The header each delivery carries: `t=<unix seconds>,v1=<hex HMAC-SHA256 of "<t>.<body>">`. */
export const WEBHOOK_SIGNATURE_HEADER = 'Lumenproof-Signature';

export const createWebhookSchema = z.strictObject({
  url: z
    .url({ protocol: /^https?$/, error: 'Enter a full web address (https://…).' })
    .max(2048, 'At most 2048 characters.'),
  events: z
    .array(z.enum(WEBHOOK_EVENTS, { error: 'Pick a known event.' }))
    .min(1, 'Pick at least one event.')
    .max(WEBHOOK_EVENTS.length)
    .refine((r) => new Set(r).size === r.length, 'Each event once.'),
});
export type CreateWebhookInput = z.infer<typeof createWebhookSchema>;

// Answers

export const webhookEndpointSchema = z.object({
  id: idSchema,
  url: z.string(),
  events: z.array(z.enum(WEBHOOK_EVENTS)),
  createdAt: instantSchema,
  disabledAt: instantSchema.nullable(),
});
export type WebhookEndpointView = z.infer<typeof webhookEndpointSchema>;

export const webhookDeliverySchema = z.object({
  id: idSchema,
  eventId: idSchema,
  event: z.string(),
  status: z.enum(['pending', 'delivered', 'failed']),
  attempts: z.number().int().min(0),
  lastStatusCode: z.number().int().nullable(),
  lastError: z.string().nullable(),
  lastAttemptAt: instantSchema.nullable(),
  deliveredAt: instantSchema.nullable(),
  createdAt: instantSchema,
});
export type WebhookDeliveryView = z.infer<typeof webhookDeliverySchema>;

// What each delivery's body holds: `{ id, type, createdAt, data }`. Claims are named with their parties as
// organisations only, never their people (server/lib/webhooks.ts claimRef).

export const webhookClaimRefSchema = z.object({
  id: idSchema,
  number: z.string().nullable(),
  stage: z.string(),
  contractor: orgRefSchema,
  manufacturer: orgRefSchema,
});

const memoRef = z.object({
  id: idSchema,
  number: z.string(),
  amount: decimalSchema,
  currency: currencySchema,
});

export const WEBHOOK_EVENT_DATA = {
  'claim.filed': z.object({
    claim: webhookClaimRefSchema,
    verdict: z.enum(['covered', 'excluded', 'review']),
    expectedCredit: decimalSchema.nullable(),
    currency: currencySchema.nullable(),
  }),
  'claim.information_requested': z.object({
    claim: webhookClaimRefSchema,
    dueOn: calendarDateSchema.nullable().optional(),
  }),
  'claim.return_authorised': z.object({ claim: webhookClaimRefSchema, returnNumber: z.string().optional() }),
  'claim.decided': z.object({
    claim: webhookClaimRefSchema,
    outcome: z.enum(['approved', 'partly_approved', 'denied']).optional(),
    resolution: z.string().nullable().optional(),
    amount: decimalSchema.nullable().optional(),
    reasonCodes: z.array(z.string()).optional(),
  }),
  'claim.credited': z.object({ claim: webhookClaimRefSchema, creditMemo: memoRef }),
  'credit_memo.voided': z.object({
    claim: webhookClaimRefSchema,
    creditMemo: memoRef,
    reversal: z.object({ id: idSchema, number: z.string() }),
    reason: z.string(),
  }),
} satisfies Record<WebhookEvent, z.ZodType>;

/** The body of one delivery of `event`. */
export function webhookBodySchema<E extends WebhookEvent | 'webhook.test'>(event: E) {
  return z.object({
    id: idSchema.meta({ description: 'The event’s id: the same on every retry and on "send again".' }),
    type: z.literal(event),
    createdAt: instantSchema,
    data:
      event === 'webhook.test'
        ? z.object({ endpoint: z.object({ id: idSchema, url: z.string() }) })
        : WEBHOOK_EVENT_DATA[event as WebhookEvent],
  });
}
