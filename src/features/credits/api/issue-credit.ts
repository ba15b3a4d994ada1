import type { CreditMemoSummary } from '../../../../shared/schemas/credits';
import { api } from '../../../lib/api-client';

/** The key is the caller's: the same key on a retry replays the first answer instead of issuing twice. */
export type CreditApprovalDto = {
  claimId: string;
  status: 'awaiting_second_approval';
  amount: string;
  currency: string;
};

/**
 * A memo (201), or, above the organisation's second-approval amount and asked by the first accountant, their
 * approval awaiting a colleague's (202).
 */
export const issueCredit = (claimId: string, idempotencyKey: string) =>
  api<{ creditMemo: CreditMemoSummary } | { creditApproval: CreditApprovalDto }>(
    `/claims/${encodeURIComponent(claimId)}/credits`,
    {
      method: 'POST',
      json: {},
      headers: { 'Idempotency-Key': idempotencyKey },
    },
  );
