import { z } from 'zod';
import {
  currencySchema,
  decimalSchema,
  instantSchema,
  pageSchema,
} from '../../../shared/schemas/answer-parts';
import {
  accountingMapSchema,
  creditBalanceSchema,
  creditExportQuerySchema,
  creditListQuerySchema,
  creditMemoSchema,
  creditMemoSummarySchema,
  creditQueueItemSchema,
  creditQueueQuerySchema,
  issueCreditSchema,
  journalSchema,
  journalQuerySchema,
  voidCreditSchema,
  warrantyCostQuerySchema,
} from '../../../shared/schemas/credits';
import { itemsOf } from '../answers';
import { op, type Registry } from '../registry';

const account = z.object({ code: z.string(), name: z.string() });
const accountingMapAnswer = z.object({
  accountingMap: z
    .object({
      debitAccount: account,
      creditAccount: account,
      journalCode: z.string(),
      updatedAt: instantSchema,
    })
    .nullable()
    .meta({ description: 'null until an administrator maps the accounts.' }),
});
const costRow = z.object({
  key: z.string(),
  label: z.string(),
  currency: currencySchema,
  credited: decimalSchema,
  pending: decimalSchema,
});

export function creditPaths(reg: Registry) {
  const tag = 'Credits and accounting';
  op(reg, {
    method: 'post',
    path: '/api/claims/:id/credits',
    tag,
    summary: 'Issue the credit memo of an approved claim (accountants of its manufacturer)',
    description:
      'The amount and currency come from the approval. The same `Idempotency-Key` replays the first answer; a ' +
      'claim already credited is a 409. Above the organisation’s second-approval amount, the first accountant’s ' +
      'request records an approval (202) and a second accountant issues the memo.',
    body: issueCreditSchema,
    idempotencyKey: 'required',
    status: 201,
    answer: { json: z.object({ creditMemo: creditMemoSummarySchema }), description: 'The memo is issued.' },
    alsoStatus: 202,
    alsoAnswer: {
      description:
        'Above the second-approval amount: your approval is recorded; a colleague issues the memo.',
      json: z.object({
        creditApproval: z.object({
          claimId: z.uuid(),
          status: z.literal('awaiting_second_approval'),
          amount: decimalSchema,
          currency: currencySchema,
          approvedBy: z.object({ id: z.uuid() }),
          approvedAt: instantSchema,
        }),
      }),
    },
    errors: [409],
  });
  op(reg, {
    method: 'get',
    path: '/api/credits',
    tag,
    summary: 'Credit memos you may see',
    query: creditListQuerySchema,
    answer: { json: pageSchema(creditMemoSchema) },
  });
  op(reg, {
    method: 'get',
    path: '/api/credits/queue',
    tag,
    summary: 'Approved claims waiting for their memo',
    query: creditQueueQuerySchema,
    answer: {
      json: pageSchema(creditQueueItemSchema).extend({
        totals: z.array(
          z.object({ currency: currencySchema, amount: decimalSchema, claims: z.number().int() }),
        ),
      }),
    },
  });
  op(reg, {
    method: 'get',
    path: '/api/credits/balances',
    tag,
    summary: 'Credit balance per contractor, manufacturer and currency',
    query: z.strictObject({}),
    answer: { json: itemsOf(creditBalanceSchema) },
  });
  op(reg, {
    method: 'get',
    path: '/api/credits/export',
    tag,
    summary: 'Memos and reversals of a period as CSV',
    query: creditExportQuerySchema,
    answer: { file: 'text/csv', description: 'One row a memo, totals per currency at the end.' },
  });
  op(reg, {
    method: 'get',
    path: '/api/credits/cost',
    tag,
    summary: 'Warranty cost by month, product and contractor',
    query: warrantyCostQuerySchema,
    answer: {
      json: z.object({
        byMonth: z.array(costRow),
        byProduct: z.array(costRow),
        byContractor: z.array(costRow),
        totals: z.array(
          z.object({ currency: currencySchema, credited: decimalSchema, pending: decimalSchema }),
        ),
      }),
    },
  });
  op(reg, {
    method: 'get',
    path: '/api/credits/:id',
    tag,
    summary: 'One credit memo',
    answer: { json: z.object({ creditMemo: creditMemoSchema }) },
  });
  op(reg, {
    method: 'get',
    path: '/api/credits/:id/pdf',
    tag,
    summary: 'The memo’s PDF',
    answer: { file: 'application/pdf', description: 'The stored PDF; `X-Content-SHA256` carries its hash.' },
  });
  op(reg, {
    method: 'post',
    path: '/api/credits/:id/void',
    tag,
    summary: 'Void a memo: issues a reversal memo',
    body: voidCreditSchema,
    status: 201,
    answer: {
      json: z.object({ creditMemo: creditMemoSummarySchema }),
      description: 'The reversal memo (read it in full at GET /api/credits/{id}).',
    },
    errors: [409],
  });
  op(reg, {
    method: 'get',
    path: '/api/credits/accounting-map',
    tag,
    summary: 'The accounts memos are booked to',
    answer: { json: accountingMapAnswer },
  });
  op(reg, {
    method: 'put',
    path: '/api/credits/accounting-map',
    tag,
    summary: 'Map the accounts once (administrators)',
    body: accountingMapSchema,
    answer: { json: accountingMapAnswer },
  });
  op(reg, {
    method: 'get',
    path: '/api/credits/journal',
    tag,
    summary: 'Memos and reversals of a period as journal entries (JSON, CSV or SIE 4)',
    query: journalQuerySchema,
    answer: {
      json: journalSchema,
      or: 'text/csv',
      description: 'JSON by default; `format=csv` a CSV file, `format=sie` an SIE 4 file (text/plain).',
    },
    errors: [409],
  });
}
