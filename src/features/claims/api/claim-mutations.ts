import type { ClaimBatchResult, ClaimDetailDto, ClaimFieldsInput } from '../../../../shared/schemas/claims';
import { api } from '../../../lib/api-client';

/** Starts a draft; the same idempotencyKey again (a double tap, a retry) answers the same draft. */
export const createClaim = (installationId: string, idempotencyKey: string, fields: ClaimFieldsInput = {}) =>
  api<{ claim: ClaimDetailDto }>('/claims', {
    method: 'POST',
    json: { installationId, ...fields },
    headers: { 'Idempotency-Key': idempotencyKey },
  });

export const updateClaim = (id: string, version: number, fields: ClaimFieldsInput) =>
  api<{ claim: ClaimDetailDto }>(`/claims/${encodeURIComponent(id)}`, {
    method: 'PATCH',
    json: { version, ...fields },
  });

/** Files a draft; keep one idempotencyKey for the retries of one filing (the server replays its answer). */
export const fileClaim = (id: string, idempotencyKey: string, version?: number) =>
  api<{ claim: ClaimDetailDto; replayed: boolean }>(`/claims/${encodeURIComponent(id)}/file`, {
    method: 'POST',
    json: version === undefined ? {} : { version },
    headers: { 'Idempotency-Key': idempotencyKey },
  });

/** The stage machine's withdraw move; the version the page shows travels as If-Match. */
export const withdrawClaim = (id: string, version: number, reason?: string) =>
  api<{ claim: { id: string; stage: string; version: number } }>(
    `/claims/${encodeURIComponent(id)}/actions/withdraw`,
    {
      method: 'POST',
      json: reason ? { reason } : {},
      headers: { 'If-Match': `"${version}"` },
    },
  );

export const deleteClaim = (id: string) =>
  api<void>(`/claims/${encodeURIComponent(id)}`, { method: 'DELETE' });

export const importClaimBatch = (csv: string, filename: string, dryRun: boolean) =>
  api<ClaimBatchResult>(`/claims/batches${dryRun ? '?dryRun=true' : ''}`, {
    method: 'POST',
    json: { csv, filename },
  });
