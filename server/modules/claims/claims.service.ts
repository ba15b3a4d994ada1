import type { AppDataSource } from '../../db/data-source';
import { createClaimDrafts } from './claims-drafts.service';
import { createClaimFiling, type EvidenceCounter } from './claims-filing.service';
import { createClaimReads } from './claims-reads.service';

/** The claims service: its reads, filing and withdrawing, and drafts (one file each). */
export function createClaimsService(
  ds: AppDataSource,
  opts: { publicUrl: (path: string) => string; evidence?: EvidenceCounter },
) {
  const reads = createClaimReads(ds);
  return { ...reads, ...createClaimFiling(ds, reads, opts), ...createClaimDrafts(ds) };
}

export type ClaimsService = ReturnType<typeof createClaimsService>;
