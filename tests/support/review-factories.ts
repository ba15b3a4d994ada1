import crypto from 'node:crypto';
import { engineContextFrom, engineInputFor } from '../../shared/claims/engine-input';
import { WAITING_ON_BY_STAGE } from '../../shared/claims/workflow';
import type { Stage } from '../../shared/claims/stages';
import { safeEvaluateClaim } from '../../shared/engine';
import type { ClaimFields, ClaimMeasurements } from '../../shared/schemas/claims';
import type { DeepPartial } from 'typeorm';
import type { AppDataSource } from '../../server/db/data-source';
import { AuditEvent } from '../../server/db/entities/audit-event.entity';
import { BenchTest } from '../../server/db/entities/bench-test.entity';
import { ClaimDocument } from '../../server/db/entities/claim-document.entity';
import { ClaimMessage } from '../../server/db/entities/claim-message.entity';
import { Claim } from '../../server/db/entities/claim.entity';
import { Decision } from '../../server/db/entities/decision.entity';
import { Installation } from '../../server/db/entities/installation.entity';
import type { Organization } from '../../server/db/entities/organization.entity';
import { OutboxMessage } from '../../server/db/entities/outbox-message.entity';
import type { ProductModel } from '../../server/db/entities/product-model.entity';
import { ReturnAuthorization } from '../../server/db/entities/return-authorization.entity';
import type { WarrantyPolicyVersion } from '../../server/db/entities/warranty-policy-version.entity';
import { createPolicy, createProduct, installationPayload } from './catalogue-factories';
import { saveNumberedClaim } from './claim-numbers';

// Claims straight into the database at any stage, with what that stage implies (an open return authorisation
// for a claim waiting for its unit, a decision for a decided one), for tests of the review workflow.

export type ReviewWorld = {
  contractor: Organization;
  manufacturer: Organization;
  product: ProductModel;
  version: WarrantyPolicyVersion;
  installation: Installation;
};

export async function createReviewWorld(
  ds: AppDataSource,
  contractor: Organization,
  manufacturer: Organization,
): Promise<ReviewWorld> {
  const product = await createProduct(ds, manufacturer);
  const { versions } = await createPolicy(ds, manufacturer, [product], [{ effectiveFrom: '2023-01-01' }]);
  const p = installationPayload(product.id);
  const repo = ds.getRepository(Installation);
  const installation = await repo.save(
    repo.create({
      contractorId: contractor.id,
      manufacturerId: manufacturer.id,
      productModelId: product.id,
      policyVersionId: versions[0].id,
      siteName: p.siteName,
      siteAddress: p.siteAddress,
      siteCity: p.siteCity,
      siteRegion: p.siteRegion,
      sitePostalCode: p.sitePostalCode,
      quantity: p.quantity,
      installDate: p.installDate,
      purchaseDate: p.purchaseDate ?? null,
      distributor: p.distributor ?? null,
      invoiceNumber: p.invoiceNumber ?? null,
      location: p.location,
      enclosure: p.enclosure,
      dimmer: p.dimmer,
      nominalSupplyVolts: p.nominalSupplyVolts,
      hoursPerDay: p.hoursPerDay,
      ambientC: p.ambientC,
      createdById: null,
    }),
  );
  return { contractor, manufacturer, product, version: versions[0], installation };
}

/** Field readings of a failed 24 W troffer: two of twelve strings open (ENGINE.md's example product). */
export const FAILED_READINGS: ClaimMeasurements = {
  supplyVolts: 277,
  inputWatts: 20.1,
  powerFactor: 0.95,
  driverOutputVolts: 48.2,
  driverOutputAmps: 0.44,
  strings: [
    { volts: 48.2, amps: undefined, darkLeds: 16 },
    { volts: 48.2, amps: undefined, darkLeds: 16 },
  ],
};

export function evaluationFor(
  w: ReviewWorld,
  fields: { failedOn: string; filedOn: string; measurements: ClaimMeasurements; serials: string[] },
) {
  const p = w.product;
  const ctx = engineContextFrom(
    { ...p, driverMaxOutputVolts: p.driverMaxOutputVolts },
    w.version,
    w.installation,
  );
  const input = engineInputFor(
    ctx,
    {
      serials: fields.serials,
      units: 1,
      failedOn: fields.failedOn,
      symptoms: ['partly_dark'],
      measurements: fields.measurements as ClaimFields['measurements'],
      observations: {},
      narrative: 'Two strings dark.',
    },
    { photos: 2, proofOfPurchase: true },
    fields.filedOn,
  );
  const result = safeEvaluateClaim(input);
  if (!result.ok) throw new Error(`test claim does not evaluate: ${JSON.stringify(result.issues)}`);
  return result.evaluation;
}

export async function createClaimAt(
  ds: AppDataSource,
  w: ReviewWorld,
  stage: Stage,
  opts: {
    filedById?: string | null;
    reviewerId?: string | null;
    verdict?: 'covered' | 'excluded' | 'review';
    filedAt?: Date;
    assigneeId?: string | null;
  } = {},
): Promise<Claim> {
  const filedAt = opts.filedAt ?? new Date('2025-06-02T10:00:00Z');
  const serial = w.installation.id.slice(0, 8).toUpperCase();
  const serials = [`SN-${serial}`];
  const evaluation =
    stage === 'draft'
      ? null
      : evaluationFor(w, {
          failedOn: '2025-05-20',
          filedOn: filedAt.toISOString().slice(0, 10),
          measurements: FAILED_READINGS,
          serials,
        });
  if (evaluation && opts.verdict) evaluation.verdict = opts.verdict;
  const repo = ds.getRepository(Claim);
  const fields: Omit<DeepPartial<Claim>, 'number'> = {
    contractorId: w.contractor.id,
    manufacturerId: w.manufacturer.id,
    installationId: w.installation.id,
    productModelId: w.product.id,
    policyVersionId: w.version.id,
    stage,
    stageChangedAt: filedAt,
    waitingOn: WAITING_ON_BY_STAGE[stage],
    units: 1,
    serials,
    failedOn: '2025-05-20',
    symptoms: ['partly_dark'],
    measurements: FAILED_READINGS,
    observations: {},
    narrative: 'Two strings went dark after a storm week.',
    evaluation,
    engineVersion: evaluation?.engineVersion ?? null,
    evaluatedAt: evaluation ? filedAt : null,
    verdict: evaluation?.verdict ?? null,
    expectedCredit: evaluation?.computed.credit ?? null,
    currency: evaluation ? 'USD' : null,
    filedAt: stage === 'draft' ? null : filedAt,
    filedById: opts.filedById ?? null,
    assignedReviewerId: opts.assigneeId ?? null,
    createdById: opts.filedById ?? null,
  };
  // A draft has no number yet; any other stage gets a fresh one (drawn again if taken).
  const claim =
    stage === 'draft'
      ? await repo.save(repo.create({ ...fields, number: null }))
      : await saveNumberedClaim(ds, filedAt, fields);
  const reviewerId = opts.reviewerId ?? opts.filedById ?? crypto.randomUUID();
  if (stage === 'needs_info') {
    await ds.getRepository(ClaimMessage).insert({
      id: crypto.randomUUID(),
      claimId: claim.id,
      kind: 'info_request',
      authorOrgId: w.manufacturer.id,
      authorId: opts.reviewerId ?? null,
      body: 'Please send a photo of the nameplate.',
      dueOn: '2025-06-20',
      answeredAt: null,
    });
  }
  if (stage === 'return_requested' || stage === 'unit_received') {
    await ds.getRepository(ReturnAuthorization).insert({
      id: crypto.randomUUID(),
      number: `RA-2506-${crypto
        .randomBytes(3)
        .toString('hex')
        .toUpperCase()
        .replace(/[01ILOUV]/g, 'X')}`,
      claimId: claim.id,
      shipTo: { name: 'Returns', line1: '1 Dock Rd', city: 'Porttown', postalCode: '10001', country: 'US' },
      instructions: null,
      shipBy: '2025-07-01',
      requestedById: reviewerId,
      receivedOn: stage === 'unit_received' ? '2025-06-10' : null,
      receivedCondition: stage === 'unit_received' ? 'as_described' : null,
    });
  }
  if (['approved', 'denied', 'credited', 'closed'].includes(stage)) {
    const denied = stage === 'denied' || stage === 'closed';
    await ds.getRepository(Decision).insert({
      id: crypto.randomUUID(),
      claimId: claim.id,
      currentClaimId: claim.id,
      outcome: denied ? 'denied' : 'approved',
      resolution: denied ? null : 'credit',
      amount: denied ? null : (evaluation?.computed.credit ?? '96.00'),
      currency: denied ? null : 'USD',
      engineAmount: evaluation?.computed.credit ?? null,
      approvedUnits: null,
      reasonCodes: denied ? ['physical_damage'] : [],
      note: 'Decided in a test.',
      overrideReason: null,
      againstEngine: false,
      decidedById: reviewerId,
      supersededAt: null,
      letterId: null,
    });
  }
  return claim;
}

/** Everything a move could touch, for "a refused move changes nothing". */
export async function snapshotClaim(ds: AppDataSource, claimId: string) {
  const claim = await ds.getRepository(Claim).findOneByOrFail({ id: claimId });
  const count = (
    entity:
      | typeof ClaimMessage
      | typeof ReturnAuthorization
      | typeof BenchTest
      | typeof Decision
      | typeof ClaimDocument,
  ) => ds.getRepository(entity).count({ where: { claimId } });
  return {
    stage: claim.stage,
    version: claim.version,
    waitingOn: claim.waitingOn,
    assignee: claim.assignedReviewerId,
    updatedAt: claim.updatedAt.toISOString(),
    audit: await ds.getRepository(AuditEvent).count({ where: { entityType: 'Claim', entityId: claimId } }),
    messages: await count(ClaimMessage),
    returns: await count(ReturnAuthorization),
    benchTests: await count(BenchTest),
    decisions: await count(Decision),
    documents: await count(ClaimDocument),
    currentDecisions: await ds.getRepository(Decision).count({ where: { currentClaimId: claimId } }),
  };
}

export const outboxCount = (ds: AppDataSource) => ds.getRepository(OutboxMessage).count();
