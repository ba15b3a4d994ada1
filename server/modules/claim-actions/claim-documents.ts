import crypto from 'node:crypto';
import type { EntityManager } from 'typeorm';
import type { Address } from '../../../shared/claims/actions.schema';
import { calendarDayIn } from '../../../shared/dates';
import type { Evaluation } from '../../../shared/engine/schema';
import { ClaimDocument, type ClaimDocumentKind } from '../../db/entities/claim-document.entity';
import type { Claim } from '../../db/entities/claim.entity';
import { Installation } from '../../db/entities/installation.entity';
import { Organization } from '../../db/entities/organization.entity';
import { ProductModel } from '../../db/entities/product-model.entity';
import { crashPoint } from '../../lib/crash-point';
import { renderDeterminationLetter, type LetterDecision } from '../../lib/pdf/determination-letter';
import { paperFor } from '../../lib/pdf/document';
import { sha256Hex } from '../../lib/pdf/hash';
import { renderPackingSlip } from '../../lib/pdf/packing-slip';
import type { Storage } from '../../lib/storage';
import { putForTransaction } from '../../lib/transaction-objects';

// The claim's generated PDFs: made once, at the move that calls for them, stored through the storage adapter
// with their hash, and served as those very bytes ever after.

export type ClaimParties = {
  contractor: Organization;
  manufacturer: Organization;
  product: ProductModel;
  installation: Installation;
};

export async function loadParties(m: EntityManager, claim: Claim): Promise<ClaimParties> {
  const [contractor, manufacturer, product, installation] = await Promise.all([
    m.findOneByOrFail(Organization, { id: claim.contractorId }),
    m.findOneByOrFail(Organization, { id: claim.manufacturerId }),
    m.findOneByOrFail(ProductModel, { id: claim.productModelId }),
    m.findOneByOrFail(Installation, { id: claim.installationId }),
  ]);
  return { contractor, manufacturer, product, installation };
}

/** The day an instant falls on where the recipient is (their organisation's zone): a letter decided at 01:00 UTC
 *  is dated the evening before in Chicago. A calendar date (a string) is already a day. */
const dayFor = (d: Date | string | null | undefined, to: Organization) =>
  d ? (typeof d === 'string' ? d.slice(0, 10) : calendarDayIn(d, to.timeZone)) : undefined;

async function store(
  m: EntityManager,
  storage: Storage,
  claim: Claim,
  kind: ClaimDocumentKind,
  filename: string,
  bytes: Buffer,
): Promise<ClaimDocument> {
  const id = crypto.randomUUID();
  const storageKey = `claims/${claim.id}/documents/${id}.pdf`;
  // Written before the row commits (a row pointing at no file must never exist); a rollback deletes it again,
  // and a crash leaves it to the storage sweep.
  await putForTransaction(m, storage, storageKey, bytes, 'application/pdf');
  await crashPoint('claim.document.after_store', m);
  const doc = m.create(ClaimDocument, {
    id,
    claimId: claim.id,
    kind,
    filename,
    storageKey,
    sha256: sha256Hex(bytes),
    byteSize: bytes.length,
  });
  await m.insert(ClaimDocument, doc);
  await crashPoint('claim.document.after_row', m);
  return doc;
}

export type { LetterDecision };

export async function createDeterminationLetter(
  m: EntityManager,
  storage: Storage,
  claim: Claim,
  parties: ClaimParties,
  evaluation: Evaluation | null,
  decision: LetterDecision,
  reviewer: string,
  decidedAt: Date,
): Promise<ClaimDocument> {
  const { contractor, manufacturer, product, installation } = parties;
  const day = dayFor(decidedAt, contractor)!;
  const bytes = await renderDeterminationLetter({
    claimNumber: claim.number ?? claim.id,
    letterDate: day,
    filedOn: dayFor(claim.filedAt, contractor) ?? day,
    failedOn: claim.failedOn ?? undefined,
    contractor: { name: contractor.name },
    manufacturer: { name: manufacturer.name },
    product: { model: product.modelNumber, name: product.name },
    site: {
      name: installation.siteName,
      address: [
        installation.siteAddress,
        `${installation.siteCity} ${installation.siteRegion} ${installation.sitePostalCode}`.trim(),
      ],
    },
    installedOn: installation.installDate,
    units: { count: claim.units ?? claim.serials.length ?? 1, serials: claim.serials },
    evaluation: {
      engineVersion: evaluation?.engineVersion ?? claim.engineVersion ?? 'none',
      verdict: evaluation?.verdict ?? 'review',
      findings: (evaluation?.findings ?? []).map((f) => ({
        code: f.code,
        severity: f.severity,
        message: f.message,
        reference: f.reference,
      })),
    },
    decision: { ...decision, reviewer, decidedOn: day },
    paper: paperFor({ currency: claim.currency ?? undefined }),
    locale: contractor.locale,
  });
  return store(m, storage, claim, 'letter', `${claim.number ?? claim.id}-determination.pdf`, bytes);
}

export async function createPackingSlip(
  m: EntityManager,
  storage: Storage,
  claim: Claim,
  parties: ClaimParties,
  ra: { number: string; shipTo: Address; instructions?: string | null },
  issuedAt: Date,
): Promise<ClaimDocument> {
  const { contractor, manufacturer, product, installation } = parties;
  const units = claim.serials.length
    ? claim.serials.map((serial) => ({ serial }))
    : Array.from({ length: Math.min(claim.units ?? 1, 50) }, () => ({}));
  const bytes = await renderPackingSlip({
    raNumber: ra.number,
    claimNumber: claim.number ?? claim.id,
    issuedOn: dayFor(issuedAt, contractor)!,
    manufacturer: { name: manufacturer.name },
    contractor: {
      name: contractor.name,
      address: [
        installation.siteName,
        installation.siteAddress,
        `${installation.siteCity} ${installation.siteRegion} ${installation.sitePostalCode}`.trim(),
      ],
    },
    shipTo: ra.shipTo,
    product: { model: product.modelNumber, name: product.name },
    units,
    instructions: ra.instructions ?? undefined,
    paper: paperFor({ currency: claim.currency ?? undefined }),
    locale: contractor.locale,
  });
  return store(m, storage, claim, 'packing_slip', `${ra.number}-packing-slip.pdf`, bytes);
}
