import type { CreditMemoDto, CreditMemoSummary, QueueItemDto } from '../../../shared/schemas/credits';
import { normalizeAmount } from '../../../shared/credits/money';
import type { CreditMemo } from '../../db/entities/credit-memo.entity';
import type { Claim } from '../../db/entities/claim.entity';
import { personRef } from '../../lib/present';

// The answers of the credits API: chosen fields, amounts as two-place decimal strings.

export function presentMemoSummary(m: {
  id: string;
  number: string;
  amount: string;
  currency: string;
  claimId: string;
}): CreditMemoSummary {
  return {
    id: m.id,
    number: m.number,
    amount: normalizeAmount(m.amount),
    currency: m.currency,
    claimId: m.claimId,
  };
}

export type LoadedMemo = CreditMemo & { reversedBy?: CreditMemo | null };

/** The memo as one viewer sees it: the issuer is named to the manufacturer's people, to a contractor only as the manufacturer. */
export function presentMemo(m: LoadedMemo, viewerOrgId: string): CreditMemoDto {
  return {
    ...presentMemoSummary(m),
    kind: m.kind,
    claim: { id: m.claimId, number: m.claim?.number ?? null },
    contractor: { id: m.contractorId, name: m.contractor?.name ?? '' },
    manufacturer: { id: m.manufacturerId, name: m.manufacturer?.name ?? '' },
    issuedAt: m.issuedAt.toISOString(),
    issuedBy: personRef(m.issuedBy, m.manufacturer, viewerOrgId),
    reason: m.reason,
    reverses: m.reversesMemo ? { id: m.reversesMemo.id, number: m.reversesMemo.number } : null,
    reversedBy: m.reversedBy ? { id: m.reversedBy.id, number: m.reversedBy.number } : null,
    pdfSha256: m.pdfSha256,
  };
}

export type FirstApproval = { approvedById: string; approverName: string; approvedAt: Date };

export function presentQueueItem(
  c: Claim,
  now: Date,
  first: FirstApproval | undefined,
  viewerId: string,
): QueueItemDto {
  return {
    claimId: c.id,
    number: c.number,
    contractor: { id: c.contractorId, name: c.contractor?.name ?? '' },
    product: {
      id: c.productModelId,
      modelNumber: c.productModel?.modelNumber ?? '',
      name: c.productModel?.name ?? '',
    },
    amount: c.expectedCredit === null ? null : normalizeAmount(c.expectedCredit),
    currency: c.currency,
    approvedAt: c.stageChangedAt.toISOString(),
    ageDays: Math.max(0, Math.floor((now.getTime() - c.stageChangedAt.getTime()) / 86_400_000)),
    // The queue is the manufacturer's own accountants': a colleague's name is theirs to see.
    secondApproval: first
      ? {
          approvedBy: { id: first.approvedById, name: first.approverName },
          approvedAt: first.approvedAt.toISOString(),
          mine: first.approvedById === viewerId,
        }
      : null,
  };
}
