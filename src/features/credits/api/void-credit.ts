import type { CreditMemoSummary, VoidCreditInput } from '../../../../shared/schemas/credits';
import { api } from '../../../lib/api-client';

export const voidCredit = (memoId: string, input: VoidCreditInput) =>
  api<{ creditMemo: CreditMemoSummary }>(`/credits/${encodeURIComponent(memoId)}/void`, {
    method: 'POST',
    json: input,
  });
