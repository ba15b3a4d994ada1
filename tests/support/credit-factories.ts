import crypto from 'node:crypto';
import type { AppDataSource } from '../../server/db/data-source';
import type { Claim } from '../../server/db/entities/claim.entity';
import { Installation } from '../../server/db/entities/installation.entity';
import type { Organization } from '../../server/db/entities/organization.entity';
import type { ProductModel } from '../../server/db/entities/product-model.entity';
import { createProduct } from './catalogue-factories';
import { saveNumberedClaim } from './claim-numbers';

// Claims already decided, written straight into the database. The review branch (issue 6) will own the
// decisions and their approved amount; until it lands, an approved claim here is stage 'approved' with the
// amount in expected_credit, which is what the credits service reads (approvedAmountOf).

export async function createInstallation(ds: AppDataSource, contractor: Organization, product: ProductModel) {
  const repo = ds.getRepository(Installation);
  return repo.save(
    repo.create({
      contractorId: contractor.id,
      manufacturerId: product.manufacturerId,
      productModelId: product.id,
      policyVersionId: null,
      siteName: `Test site ${crypto.randomBytes(3).toString('hex')}`,
      siteAddress: '1 Test Street',
      siteCity: 'Testville',
      siteRegion: 'WA',
      sitePostalCode: '98000',
      quantity: 4,
      installDate: '2024-03-01',
      purchaseDate: '2024-02-15',
      distributor: 'Test Supply',
      invoiceNumber: 'INV-1',
      location: 'dry',
      enclosure: 'open',
      dimmer: 'none',
      nominalSupplyVolts: 277,
      hoursPerDay: 12,
      ambientC: 25,
      createdById: null,
    }),
  );
}

export async function createApprovedClaim(
  ds: AppDataSource,
  opts: {
    manufacturer: Organization;
    contractor: Organization;
    amount?: string | null;
    currency?: string;
    product?: ProductModel;
    stage?: Claim['stage'];
    approvedAt?: Date;
    units?: number;
  },
) {
  const product = opts.product ?? (await createProduct(ds, opts.manufacturer));
  const installation = await createInstallation(ds, opts.contractor, product);
  const at = opts.approvedAt ?? new Date();
  return saveNumberedClaim(ds, at, {
    contractorId: opts.contractor.id,
    manufacturerId: opts.manufacturer.id,
    installationId: installation.id,
    productModelId: product.id,
    policyVersionId: null,
    stage: opts.stage ?? 'approved',
    stageChangedAt: at,
    waitingOn: null,
    units: opts.units ?? 2,
    serials: [],
    failedOn: '2025-06-01',
    symptoms: ['partly_dark'],
    measurements: {},
    observations: {},
    narrative: 'Test claim',
    evaluation: null,
    engineVersion: null,
    evaluatedAt: null,
    verdict: null,
    expectedCredit: opts.amount === undefined ? '192.00' : opts.amount,
    currency: opts.currency ?? 'USD',
    filedAt: at,
    filedById: null,
    batchId: null,
    assignedReviewerId: null,
    createdById: null,
  });
}
