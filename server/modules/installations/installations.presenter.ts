import { checkInstallationFit } from '../../../shared/catalogue/installation-fit';
import type {
  InstallationDetailDto,
  InstallationDto,
  NOMINAL_SUPPLY_VOLTS,
} from '../../../shared/schemas/catalogue';
import type { Installation } from '../../db/entities/installation.entity';
import type { ProductModel } from '../../db/entities/product-model.entity';
import type { WarrantyPolicyVersion } from '../../db/entities/warranty-policy-version.entity';
import { orgRef, pick, stamps } from '../../lib/present';
import { presentProduct } from '../products/products.presenter';

/**
 * What presentInstallation reads: a loaded entity (its units counted), or a list row read by hand with its serial
 * count (installations.service.ts).
 */
export type InstallationListRow = Pick<
  Installation,
  | SiteField
  | 'id'
  | 'contractorId'
  | 'manufacturerId'
  | 'productModelId'
  | 'nominalSupplyVolts'
  | 'createdAt'
  | 'updatedAt'
  | 'version'
> & {
  contractor: { name: string } | null;
  manufacturer: { name: string } | null;
  productModel: Pick<ProductModel, 'modelNumber' | 'name' | 'family'>;
  policyVersion:
    | (Pick<WarrantyPolicyVersion, 'id' | 'policyId' | 'versionNumber' | 'effectiveFrom'> & {
        policy: { name: string } | null;
      })
    | null;
  serialCount?: number;
  units?: readonly unknown[];
};

/** The site, the purchase and the conditions: what the answers show and the audit log records. */
const SITE_FIELDS = [
  'siteName',
  'siteAddress',
  'siteCity',
  'siteRegion',
  'sitePostalCode',
  'quantity',
  'installDate',
  'purchaseDate',
  'distributor',
  'invoiceNumber',
  'lot',
  'location',
  'enclosure',
  'dimmer',
  'hoursPerDay',
  'ambientC',
] as const satisfies readonly (keyof InstallationDto & keyof Installation)[];
type SiteField = (typeof SITE_FIELDS)[number];

export function presentInstallation(i: InstallationListRow): InstallationDto {
  const v = i.policyVersion;
  return {
    id: i.id,
    contractor: orgRef(i.contractorId, i.contractor),
    manufacturer: orgRef(i.manufacturerId, i.manufacturer),
    product: {
      id: i.productModelId,
      modelNumber: i.productModel.modelNumber,
      name: i.productModel.name,
      family: i.productModel.family,
    },
    ...pick(i, SITE_FIELDS),
    serialCount: i.serialCount ?? i.units?.length ?? 0,
    nominalSupplyVolts: i.nominalSupplyVolts as (typeof NOMINAL_SUPPLY_VOLTS)[number],
    policyVersion: v
      ? {
          id: v.id,
          policyId: v.policyId,
          policyName: v.policy?.name ?? '',
          versionNumber: v.versionNumber,
          effectiveFrom: v.effectiveFrom,
        }
      : null,
    ...stamps(i),
  };
}

export function presentInstallationDetail(i: Installation): InstallationDetailDto {
  const base = presentInstallation(i);
  const productRatings = presentProduct(i.productModel);
  return {
    ...base,
    serials: (i.units ?? []).map((u) => u.serial).sort(),
    fit: checkInstallationFit(productRatings, {
      location: i.location,
      enclosure: i.enclosure,
      dimmer: i.dimmer,
      nominalSupplyVolts: base.nominalSupplyVolts,
      hoursPerDay: i.hoursPerDay,
      ambientC: i.ambientC,
    }),
    productRatings,
  };
}

type AuditSource = Pick<Installation, SiteField> & {
  productModelId: string;
  nominalSupplyVolts: number;
  policyVersionId: string | null;
  serials: string[];
};

export function installationAuditView(i: AuditSource) {
  return {
    productModelId: i.productModelId,
    ...pick(i, SITE_FIELDS),
    nominalSupplyVolts: i.nominalSupplyVolts,
    policyVersionId: i.policyVersionId,
    serials: [...i.serials].sort(),
  };
}
