import type { AttachmentDto } from '../../../shared/schemas/attachments';
import type { ClaimDetailDto, ClaimListItemDto, FilingIssue } from '../../../shared/schemas/claims';
import type { HistoryEventDto } from '../../../shared/schemas/catalogue';
import type { ClaimBatch } from '../../db/entities/claim-batch.entity';
import { historyEventOf } from '../../lib/history';
import { personRef } from '../../lib/present';
import { presentAttachment } from '../attachments/attachments.presenter';
import { currentFilingIssues } from './claims-filing.service';
import type { ClaimListRow, ClaimPage, LoadedClaim } from './claims-reads.service';
import { engineContextOf } from './engine-input';

const iso = (v: Date | string) => (typeof v === 'string' ? v : v.toISOString());

/** A row of the list (its times already ISO strings) or a loaded claim (Dates). */
export function presentClaimListItem(c: ClaimListRow | LoadedClaim): ClaimListItemDto {
  return {
    id: c.id,
    number: c.number,
    stage: c.stage,
    waitingOn: c.waitingOn,
    contractor: { id: c.contractorId, name: c.contractor?.name ?? '' },
    manufacturer: { id: c.manufacturerId, name: c.manufacturer?.name ?? '' },
    product: {
      id: c.productModelId,
      modelNumber: c.productModel?.modelNumber ?? '',
      name: c.productModel?.name ?? '',
      family: c.productModel?.family ?? 'other',
    },
    installation: {
      id: c.installationId,
      siteName: c.installation?.siteName ?? '',
      siteCity: c.installation?.siteCity ?? '',
    },
    serials: c.serials,
    units: c.units ?? c.serials.length,
    failedOn: c.failedOn,
    filedAt: c.filedAt ? iso(c.filedAt) : null,
    stageChangedAt: iso(c.stageChangedAt),
    evaluation: c.verdict && c.engineVersion ? { verdict: c.verdict, engineVersion: c.engineVersion } : null,
    expectedCredit: c.expectedCredit,
    currency: c.currency,
    createdAt: iso(c.createdAt),
    updatedAt: iso(c.updatedAt),
    version: c.version,
  };
}

export function presentClaimDetail(
  c: LoadedClaim,
  extra: {
    history: HistoryEventDto[];
    attachments: AttachmentDto[];
    filingIssues: FilingIssue[];
    createdBy: { id: string | null; name: string } | null;
  },
): ClaimDetailDto {
  const i = c.installation;
  const v = c.policyVersion;
  return {
    ...presentClaimListItem(c),
    symptoms: c.symptoms,
    measurements: c.measurements,
    observations: c.observations,
    narrative: c.narrative,
    installationDetail: {
      id: i.id,
      siteName: i.siteName,
      siteAddress: i.siteAddress,
      siteCity: i.siteCity,
      siteRegion: i.siteRegion,
      quantity: i.quantity,
      installDate: i.installDate,
      purchaseDate: i.purchaseDate,
      serials: i.units.map((u) => u.serial).sort(),
      policyVersion: v
        ? {
            id: v.id,
            policyName: v.policy?.name ?? '',
            versionNumber: v.versionNumber,
            effectiveFrom: v.effectiveFrom,
          }
        : null,
    },
    engineContext: engineContextOf(c.productModel, v, i),
    evaluation:
      c.evaluation && c.evaluatedAt ? { ...c.evaluation, evaluatedAt: c.evaluatedAt.toISOString() } : null,
    attachments: extra.attachments,
    requests: [],
    decision: null,
    credit: null,
    history: extra.history,
    filingIssues: extra.filingIssues,
    createdBy: extra.createdBy,
  };
}

/** A claim's page (ClaimsReads.findForPage) as a viewer of the organisation sees it. */
export function presentClaimPage(page: ClaimPage, viewerOrgId: string): ClaimDetailDto {
  const c = page.claim;
  return presentClaimDetail(c, {
    history: page.history.map((h) => historyEventOf(h.event, h, viewerOrgId)),
    attachments: page.attachments.map((a) =>
      presentAttachment(a, `/api/claims/${c.id}/attachments`, viewerOrgId),
    ),
    filingIssues: c.stage === 'draft' ? currentFilingIssues(c) : [],
    createdBy: personRef(
      c.creator,
      c.creator?.organizationId === c.manufacturerId ? c.manufacturer : c.contractor,
      viewerOrgId,
    ),
  });
}

/** GET /api/claims/batches/:id: the batch and its claims as the list shows them. */
export function presentBatchPage(p: { batch: ClaimBatch; claimIds: string[]; items: ClaimListRow[] }) {
  return {
    batch: {
      id: p.batch.id,
      filename: p.batch.filename,
      rowCount: p.batch.rowCount,
      createdAt: p.batch.createdAt.toISOString(),
      claimIds: p.claimIds,
    },
    claims: p.items.map(presentClaimListItem),
  };
}
