import type { ClaimBatchResult, ClaimDetailDto, ClaimFieldsInput } from '../../../../shared/schemas/claims';
import { api } from '../../../lib/api-client';

export const createClaim = (installationId: string, fields: ClaimFieldsInput = {}) =>
  api<{ claim: ClaimDetailDto }>('/claims', { method: 'POST', json: { installationId, ...fields } });

export const updateClaim = (id: string, version: number, fields: ClaimFieldsInput) =>
  api<{ claim: ClaimDetailDto }>(`/claims/${encodeURIComponent(id)}`, { method: 'PATCH', json: { version, ...fields } });

export const fileClaim = (id: string, version?: number) =>
  api<{ claim: ClaimDetailDto; replayed: boolean }>(`/claims/${encodeURIComponent(id)}/file`, {
    method: 'POST',
    json: version === undefined ? {} : { version },
    headers: { 'Idempotency-Key': `file-${id}` },
  });

export const withdrawClaim = (id: string, reason?: string) =>
  api<{ claim: ClaimDetailDto }>(`/claims/${encodeURIComponent(id)}/withdraw`, { method: 'POST', json: reason ? { reason } : {} });

export const deleteClaim = (id: string) => api<void>(`/claims/${encodeURIComponent(id)}`, { method: 'DELETE' });

export const importClaimBatch = (csv: string, filename: string, dryRun: boolean) =>
  api<ClaimBatchResult>(`/claims/batches${dryRun ? '?dryRun=true' : ''}`, { method: 'POST', json: { csv, filename } });
