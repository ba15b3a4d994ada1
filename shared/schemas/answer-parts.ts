import { z } from 'zod';

// Pieces of the API's answers (what the server sends, not what it accepts). Answer schemas are zod like the
// payloads so that the TS types the client reads are z.infer of them, and the OpenAPI document
// (server/openapi) describes the same thing the presenters are typed against.

/** An instant as the presenters write it: Date.prototype.toISOString(), UTC. */
export const instantSchema = z.iso.datetime({ offset: true });
/** A calendar date, YYYY-MM-DD. */
export const calendarDateSchema = z.iso.date();
/** Money as a decimal string, never a float (DEVELOPERS.md). */
export const decimalSchema = z.string().regex(/^-?\d+(\.\d+)?$/);
/** An ISO 4217 code. */
export const currencySchema = z.string().regex(/^[A-Z]{3}$/);
export const idSchema = z.uuid();
export const orgRefSchema = z.object({ id: idSchema, name: z.string() });

/** `{ items, total, page, pageSize }`: every paged list (API.md). */
export function pageSchema<T extends z.ZodType>(item: T) {
  return z.object({
    items: z.array(item),
    total: z.number().int().min(0),
    page: z.number().int().min(1),
    pageSize: z.number().int().min(1),
  });
}

/** An audit record as a record's history shows it (server/lib/history.ts): people named to their own side. */
export const historyEventSchema = z.object({
  /** The audit record's id (a sequence number as text, not a UUID). */
  id: z.string(),
  occurredAt: instantSchema,
  action: z.string(),
  actor: z.object({ name: z.string(), organization: z.string() }).nullable(),
  before: z.record(z.string(), z.unknown()).nullable(),
  after: z.record(z.string(), z.unknown()).nullable(),
});
