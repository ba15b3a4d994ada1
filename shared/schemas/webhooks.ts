import { z } from 'zod';
import { idSchema, instantSchema } from './answer-parts';

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
