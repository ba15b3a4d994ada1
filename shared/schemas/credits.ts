import { z } from 'zod';
import { str } from './text';
import { listQuerySchema } from './users';
import {
  calendarDateSchema,
  currencySchema,
  decimalSchema,
  idSchema,
  instantSchema,
  orgRefSchema,
} from './answer-parts';

// Payloads of the credits API: issuing a memo, voiding one, the lists, the export and the cost view.

export const MEMO_KINDS = ['credit', 'reversal'] as const;
export type MemoKind = (typeof MEMO_KINDS)[number];

const uuid = z.uuid({ error: 'Not a valid id.' });
const isoDate = z.iso.date({ error: 'Use a date as YYYY-MM-DD.' });

/** The body of POST /api/claims/:id/credits: the amount and currency come from the approved decision. */
export const issueCreditSchema = z.strictObject({
  /** A line the accountant adds to the memo's audit record (not printed). */
  note: str().trim().max(500, 'Keep the note under 500 characters.').optional(),
});
export type IssueCreditInput = z.infer<typeof issueCreditSchema>;

/** Printable ASCII, 8-255 characters: a UUID from the client fits. */
export const idempotencyKeySchema = str({ error: 'Send an Idempotency-Key header.' }).regex(
  /^[\x21-\x7e]{8,255}$/,
  'The Idempotency-Key header must be 8 to 255 printable characters.',
);

export const voidCreditSchema = z.strictObject({
  reason: str({ error: 'Give the reason for voiding the credit.' })
    .trim()
    .min(5, 'Give the reason for voiding the credit (at least 5 characters).')
    .max(2000, 'Keep the reason under 2,000 characters.'),
});
export type VoidCreditInput = z.infer<typeof voidCreditSchema>;

const dateRange = {
  from: isoDate.optional(),
  to: isoDate.optional(),
};

function rangeInOrder(v: { from?: string; to?: string }) {
  return !v.from || !v.to || v.from <= v.to;
}
const rangeMessage = { message: 'The start date must not be after the end date.', path: ['to'] };

export const creditListQuerySchema = listQuerySchema
  .extend({
    sort: z.enum(['issuedAt', '-issuedAt', 'number', '-number', 'amount', '-amount']).default('-issuedAt'),
    kind: z.enum(MEMO_KINDS).optional(),
    contractorId: uuid.optional(),
    manufacturerId: uuid.optional(),
    currency: str()
      .regex(/^[A-Z]{3}$/, 'A currency is three capital letters.')
      .optional(),
    ...dateRange,
  })
  .refine(rangeInOrder, rangeMessage);
export type CreditListQuery = z.infer<typeof creditListQuerySchema>;

export const creditQueueQuerySchema = listQuerySchema.extend({
  sort: z.enum(['approvedAt', '-approvedAt', 'amount', '-amount', 'number', '-number']).default('approvedAt'),
  contractorId: uuid.optional(),
  currency: str()
    .regex(/^[A-Z]{3}$/, 'A currency is three capital letters.')
    .optional(),
  /** Only claims approved at least this many days ago. */
  minAgeDays: z.coerce.number().int().min(0).max(3650).optional(),
});
export type CreditQueueQuery = z.infer<typeof creditQueueQuerySchema>;

export const creditExportQuerySchema = z
  .strictObject({
    from: isoDate,
    to: isoDate,
  })
  .refine(rangeInOrder, rangeMessage)
  .refine((v) => Date.parse(v.to) - Date.parse(v.from) <= 366 * 5 * 86_400_000, {
    message: 'Export at most five years at a time.',
    path: ['to'],
  });
export type CreditExportQuery = z.infer<typeof creditExportQuerySchema>;

const accountRef = (which: string) =>
  z.strictObject({
    code: str({ error: `Give the ${which} account's code.` })
      .trim()
      .regex(
        /^[A-Za-z0-9][A-Za-z0-9.-]{0,19}$/,
        'An account code is 1 to 20 letters, digits, dots or dashes.',
      ),
    name: str({ error: `Give the ${which} account's name.` })
      .trim()
      .min(1, `Give the ${which} account's name.`)
      .max(100, 'Keep the name under 100 characters.'),
  });

/** PUT /api/credits/accounting-map: the accounts the journal export books credit memos to. */
export const accountingMapSchema = z
  .strictObject({
    debitAccount: accountRef('debit'),
    creditAccount: accountRef('credit'),
    journalCode: str({ error: 'Give the journal (voucher series) code.' })
      .trim()
      .regex(/^[A-Za-z0-9]{1,10}$/, 'A journal code is 1 to 10 letters or digits.'),
  })
  .refine((v) => v.debitAccount.code !== v.creditAccount.code, {
    message: 'Debit and credit must be two different accounts.',
    path: ['creditAccount', 'code'],
  });
export type AccountingMapInput = z.infer<typeof accountingMapSchema>;

export const JOURNAL_FORMATS = ['csv', 'sie', 'json'] as const;

/** GET /api/credits/journal: memos and reversals issued in the range, as journal entries. */
export const journalQuerySchema = z
  .strictObject({
    from: isoDate,
    to: isoDate,
    format: z.enum(JOURNAL_FORMATS).default('json'),
    currency: str()
      .regex(/^[A-Z]{3}$/, 'A currency is three capital letters.')
      .optional(),
  })
  .refine(rangeInOrder, rangeMessage)
  .refine((v) => Date.parse(v.to) - Date.parse(v.from) <= 366 * 5 * 86_400_000, {
    message: 'Export at most five years at a time.',
    path: ['to'],
  });
export type JournalQuery = z.infer<typeof journalQuerySchema>;

export const warrantyCostQuerySchema = z
  .strictObject({
    ...dateRange,
    currency: str()
      .regex(/^[A-Z]{3}$/)
      .optional(),
  })
  .refine(rangeInOrder, rangeMessage);
export type WarrantyCostQuery = z.infer<typeof warrantyCostQuerySchema>;

// Answers (zod, so that the types below and the OpenAPI document cannot drift apart)

export const creditMemoSummarySchema = z.object({
  id: idSchema,
  number: z.string(),
  amount: decimalSchema,
  currency: currencySchema,
  claimId: idSchema,
});
export type CreditMemoSummary = z.infer<typeof creditMemoSummarySchema>;

export const creditMemoSchema = creditMemoSummarySchema.extend({
  kind: z.enum(MEMO_KINDS),
  claim: z.object({ id: idSchema, number: z.string().nullable() }),
  contractor: orgRefSchema,
  manufacturer: orgRefSchema,
  issuedAt: instantSchema,
  /** Named to the issuer's own organisation; to the other side, the organisation's name and no id. */
  issuedBy: z.object({ id: idSchema.nullable(), name: z.string() }).nullable(),
  reason: z.string().nullable(),
  reverses: z.object({ id: idSchema, number: z.string() }).nullable(),
  reversedBy: z.object({ id: idSchema, number: z.string() }).nullable(),
  pdfSha256: z.string().regex(/^[0-9a-f]{64}$/),
});
export type CreditMemoDto = z.infer<typeof creditMemoSchema>;

export const creditQueueItemSchema = z.object({
  claimId: idSchema,
  number: z.string().nullable(),
  contractor: orgRefSchema,
  product: z.object({ id: idSchema, modelNumber: z.string(), name: z.string() }),
  amount: decimalSchema.nullable(),
  currency: currencySchema.nullable(),
  approvedAt: instantSchema,
  ageDays: z.number().int(),
  /** Above the organisation's second-approval amount, once one accountant has approved: who, and whether it was you. */
  secondApproval: z
    .object({ approvedBy: orgRefSchema, approvedAt: instantSchema, mine: z.boolean() })
    .nullable(),
});
export type QueueItemDto = z.infer<typeof creditQueueItemSchema>;

export const creditBalanceSchema = z.object({
  contractor: orgRefSchema,
  manufacturer: orgRefSchema,
  currency: currencySchema,
  balance: decimalSchema,
  memos: z.number().int(),
});
export type BalanceDto = z.infer<typeof creditBalanceSchema>;

export type AccountingMapDto = AccountingMapInput & { updatedAt: string | null };

/** A journal column that is either an amount or empty (a line is a debit or a credit, never both). */
const journalAmountSchema = z.union([decimalSchema, z.literal('')]);

/** One line of GET /api/credits/journal (shared/credits/journal.ts builds them). */
export const journalLineSchema = z.object({
  journal: z.string(),
  entry: z.string(),
  date: calendarDateSchema,
  account: z.string(),
  accountName: z.string(),
  debit: journalAmountSchema,
  credit: journalAmountSchema,
  currency: currencySchema,
  memoNumber: z.string(),
  kind: z.enum(MEMO_KINDS),
  claimNumber: z.string(),
  contractor: z.string(),
  contractorId: idSchema,
  description: z.string(),
});
export type JournalLine = z.infer<typeof journalLineSchema>;

/** Per currency: entries and the sums of the debit and credit columns. */
export const journalTotalSchema = z.object({
  currency: currencySchema,
  entries: z.number().int().min(0),
  debit: decimalSchema,
  credit: decimalSchema,
});
export type JournalTotal = z.infer<typeof journalTotalSchema>;

export const journalSchema = z.object({
  from: calendarDateSchema,
  to: calendarDateSchema,
  lines: z.array(journalLineSchema),
  totals: z.array(journalTotalSchema),
});
export type JournalDto = z.infer<typeof journalSchema>;

export type CostRow = { key: string; label: string; currency: string; credited: string; pending: string };
export type WarrantyCostDto = {
  byMonth: CostRow[];
  byProduct: CostRow[];
  byContractor: CostRow[];
  totals: { currency: string; credited: string; pending: string }[];
};
