import { checkInstallationFit } from '../../../shared/catalogue/installation-fit';
import type { InstallationDetailDto, InstallationDto, NOMINAL_SUPPLY_VOLTS } from '../../../shared/schemas/catalogue';
import type { Installation } from '../../db/entities/installation.entity';
import { presentProduct } from '../products/products.presenter';

type Loaded = Installation & { serialCount?: number };

export function presentInstallation(i: Loaded): InstallationDto {
  const v = i.policyVersion;
  return {
    id: i.id,
    contractor: { id: i.contractorId, name: i.contractor?.name ?? '' },
    manufacturer: { id: i.manufacturerId, name: i.manufacturer?.name ?? '' },
    product: { id: i.productModelId, modelNumber: i.productModel.modelNumber, name: i.productModel.name, family: i.productModel.family },
    siteName: i.siteName,
    siteAddress: i.siteAddress,
    siteCity: i.siteCity,
    siteRegion: i.siteRegion,
    sitePostalCode: i.sitePostalCode,
    quantity: i.quantity,
    serialCount: i.serialCount ?? i.units?.length ?? 0,
    installDate: i.installDate,
    purchaseDate: i.purchaseDate,
    distributor: i.distributor,
    invoiceNumber: i.invoiceNumber,
    location: i.location,
    enclosure: i.enclosure,
    dimmer: i.dimmer,
    nominalSupplyVolts: i.nominalSupplyVolts as (typeof NOMINAL_SUPPLY_VOLTS)[number],
    hoursPerDay: i.hoursPerDay,
    ambientC: i.ambientC,
    policyVersion: v
      ? { id: v.id, policyId: v.policyId, policyName: v.policy?.name ?? '', versionNumber: v.versionNumber, effectiveFrom: v.effectiveFrom }
      : null,
    createdAt: i.createdAt.toISOString(),
    updatedAt: i.updatedAt.toISOString(),
    version: i.version,
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

export function installationAuditView(i: {
  productModelId: string;
  siteName: string;
  siteAddress: string;
  siteCity: string;
  siteRegion: string;
  sitePostalCode: string;
  quantity: number;
  installDate: string;
  purchaseDate: string | null;
  distributor: string | null;
  invoiceNumber: string | null;
  location: string;
  enclosure: string;
  dimmer: string;
  nominalSupplyVolts: number;
  hoursPerDay: number;
  ambientC: number;
  policyVersionId: string | null;
  serials: string[];
}) {
  return {
    productModelId: i.productModelId,
    siteName: i.siteName,
    siteAddress: i.siteAddress,
    siteCity: i.siteCity,
    siteRegion: i.siteRegion,
    sitePostalCode: i.sitePostalCode,
    quantity: i.quantity,
    installDate: i.installDate,
    purchaseDate: i.purchaseDate,
    distributor: i.distributor,
    invoiceNumber: i.invoiceNumber,
    location: i.location,
    enclosure: i.enclosure,
    dimmer: i.dimmer,
    nominalSupplyVolts: i.nominalSupplyVolts,
    hoursPerDay: i.hoursPerDay,
    ambientC: i.ambientC,
    policyVersionId: i.policyVersionId,
    serials: [...i.serials].sort(),
  };
}
