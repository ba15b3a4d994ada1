import crypto from 'node:crypto';
import type { InstallationInput, PolicyTermsInput, ProductInput } from '../../shared/schemas/catalogue';
import type { AppDataSource } from '../../server/db/data-source';
import type { Organization } from '../../server/db/entities/organization.entity';
import { PolicyModel } from '../../server/db/entities/policy-model.entity';
import { ProductModel } from '../../server/db/entities/product-model.entity';
import { WarrantyPolicyVersion } from '../../server/db/entities/warranty-policy-version.entity';
import { WarrantyPolicy } from '../../server/db/entities/warranty-policy.entity';

const unique = () => crypto.randomBytes(4).toString('hex').toUpperCase();

/** A valid product payload: 24 W, 12 strings x 16 LEDs at 3.0 V, 0.44 A (the ENGINE.md example). */
export function productPayload(extra: Partial<ProductInput> = {}): ProductInput {
  return {
    modelNumber: `TP-${unique()}`,
    name: 'Test troffer 24 W',
    family: 'troffer',
    ratedInputWatts: 24,
    inputVoltsMin: 120,
    inputVoltsMax: 277,
    ratedLumens: 3200,
    ledStrings: 12,
    ledsPerString: 16,
    ledForwardVolts: 3.0,
    driverOutputAmps: 0.44,
    driverMaxOutputVolts: 56,
    location: 'damp',
    enclosedRated: false,
    dimming: '0-10v',
    ambientMaxC: 45,
    ratedLifeHours: 50000,
    activeCooling: false,
    ...extra,
  };
}

export function termsPayload(extra: Partial<PolicyTermsInput> = {}): PolicyTermsInput {
  return {
    effectiveFrom: '2023-01-01',
    termMonths: 60,
    fullCoverageMonths: 36,
    filingWindowDays: 90,
    darkLedFailurePercent: 10,
    unitCredit: '96.00',
    currency: 'USD',
    labourAllowance: '35.00',
    requiredPhotos: 2,
    proofOfPurchaseRequired: true,
    exclusions: ['location_misapplication', 'physical_damage'],
    denialReasons: [{ code: 'MISAPP-WET', label: 'Installed in a wetter location than rated' }],
    ...extra,
  };
}

export function installationPayload(
  productModelId: string,
  extra: Partial<InstallationInput> = {},
): InstallationInput {
  return {
    productModelId,
    siteName: `Test site ${unique()}`,
    siteAddress: '1 Test Street',
    siteCity: 'Testville',
    siteRegion: 'WA',
    sitePostalCode: '98000',
    quantity: 4,
    serials: [`SN-${unique()}`, `SN-${unique()}`],
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
    ...extra,
  };
}

/** Straight into the database, for tests that are not about creating products. */
export async function createProduct(
  ds: AppDataSource,
  manufacturer: Organization,
  extra: Partial<ProductInput> = {},
) {
  const repo = ds.getRepository(ProductModel);
  const { driverMaxOutputVolts, ...p } = productPayload(extra);
  return repo.save(
    repo.create({
      ...p,
      driverMaxOutputVolts: driverMaxOutputVolts ?? null,
      manufacturerId: manufacturer.id,
    }),
  );
}

export async function createPolicy(
  ds: AppDataSource,
  manufacturer: Organization,
  models: ProductModel[],
  versions: { effectiveFrom: string; unitCredit?: string }[],
) {
  const policy = await ds.getRepository(WarrantyPolicy).save(
    ds.getRepository(WarrantyPolicy).create({
      manufacturerId: manufacturer.id,
      name: `Policy ${unique()}`,
      latestVersionNumber: versions.length,
    }),
  );
  const saved: WarrantyPolicyVersion[] = [];
  for (const [i, v] of versions.entries()) {
    const t = termsPayload({ effectiveFrom: v.effectiveFrom, unitCredit: v.unitCredit ?? '96.00' });
    saved.push(
      await ds.getRepository(WarrantyPolicyVersion).save(
        ds.getRepository(WarrantyPolicyVersion).create({
          policyId: policy.id,
          versionNumber: i + 1,
          effectiveFrom: t.effectiveFrom,
          termMonths: t.termMonths,
          fullCoverageMonths: t.fullCoverageMonths,
          filingWindowDays: t.filingWindowDays,
          darkLedFailurePercent: '10.00',
          unitCredit: t.unitCredit,
          currency: 'USD',
          labourAllowance: t.labourAllowance,
          requiredPhotos: 2,
          proofOfPurchaseRequired: true,
          exclusions: [],
          denialReasons: [],
          changeNote: null,
          createdById: null,
        }),
      ),
    );
  }
  if (models.length)
    await ds
      .getRepository(PolicyModel)
      .insert(models.map((m) => ({ policyId: policy.id, productModelId: m.id })));
  return { policy, versions: saved };
}
