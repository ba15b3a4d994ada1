import type { CreditMemoSummary } from '../../../../shared/schemas/credits';
import { api } from '../../../lib/api-client';

/** The key is the caller's: the same key on a retry replays the first answer instead of issuing twice. */
export const issueCredit = (claimId: string, idempotencyKey: string) =>
  api<{ creditMemo: CreditMemoSummary }>(`/claims/${encodeURIComponent(claimId)}/credits`, {
    method: 'POST',
    json: {},
    headers: { 'Idempotency-Key': idempotencyKey },
  });
