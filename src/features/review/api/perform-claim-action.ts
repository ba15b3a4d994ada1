import type { ClaimWorkflowDto } from '../../../../shared/claims/workflow';
import type { ClaimActionName } from '../../../../shared/claims/stages';
import { api } from '../../../lib/api-client';

/** One move of the stage machine; the version the screen shows travels as If-Match. */
export function performClaimAction(id: string, action: ClaimActionName, payload: unknown, version: number) {
  return api<{ claim: { id: string; stage: string; version: number }; workflow: ClaimWorkflowDto }>(
    `/claims/${id}/actions/${action}`,
    {
      method: 'POST',
      json: payload,
      headers: { 'If-Match': `"${version}"` },
    },
  );
}

export function assignClaim(id: string, assigneeId: string | null, version: number) {
  return api<{ claim: { id: string; version: number } }>(`/claims/${id}/assign`, {
    method: 'POST',
    json: { assigneeId },
    headers: { 'If-Match': `"${version}"` },
  });
}
