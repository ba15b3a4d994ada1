import type { PolicyDetailDto, PolicyDto, PolicyVersionDto } from '../../../shared/schemas/catalogue';
import type { PolicyModel } from '../../db/entities/policy-model.entity';
import type { WarrantyPolicyVersion } from '../../db/entities/warranty-policy-version.entity';
import type { WarrantyPolicy } from '../../db/entities/warranty-policy.entity';

export function presentVersion(v: WarrantyPolicyVersion): PolicyVersionDto {
  return {
    id: v.id,
    policyId: v.policyId,
    versionNumber: v.versionNumber,
    effectiveFrom: v.effectiveFrom,
    termMonths: v.termMonths,
    fullCoverageMonths: v.fullCoverageMonths,
    filingWindowDays: v.filingWindowDays,
    darkLedFailurePercent: Number(v.darkLedFailurePercent),
    unitCredit: v.unitCredit,
    currency: v.currency,
    labourAllowance: v.labourAllowance,
    requiredPhotos: v.requiredPhotos,
    proofOfPurchaseRequired: v.proofOfPurchaseRequired,
    exclusions: v.exclusions,
    denialReasons: v.denialReasons,
    changeNote: v.changeNote,
    createdAt: v.createdAt.toISOString(),
  };
}

/** The terms as the audit log records them. */
export function versionAuditView(v: Omit<PolicyVersionDto, 'id' | 'policyId' | 'createdAt'>) {
  return {
    versionNumber: v.versionNumber,
    effectiveFrom: v.effectiveFrom,
    termMonths: v.termMonths,
    fullCoverageMonths: v.fullCoverageMonths,
    filingWindowDays: v.filingWindowDays,
    darkLedFailurePercent: v.darkLedFailurePercent,
    unitCredit: v.unitCredit,
    currency: v.currency,
    labourAllowance: v.labourAllowance,
    requiredPhotos: v.requiredPhotos,
    proofOfPurchaseRequired: v.proofOfPurchaseRequired,
    exclusions: v.exclusions,
    denialReasons: v.denialReasons,
    changeNote: v.changeNote,
  };
}

type Loaded = WarrantyPolicy & { latest?: WarrantyPolicyVersion | null };

export function presentPolicy(p: Loaded, models: PolicyModel[]): PolicyDto {
  return {
    id: p.id,
    manufacturer: { id: p.manufacturerId, name: p.manufacturer?.name ?? '' },
    name: p.name,
    latestVersionNumber: p.latestVersionNumber,
    latestVersion: p.latest ? presentVersion(p.latest) : null,
    models: models
      .filter((m) => m.policyId === p.id)
      .map((m) => ({ id: m.productModelId, modelNumber: m.productModel.modelNumber, name: m.productModel.name }))
      .sort((a, b) => a.modelNumber.localeCompare(b.modelNumber)),
    createdAt: p.createdAt.toISOString(),
    updatedAt: p.updatedAt.toISOString(),
    version: p.version,
  };
}

export function presentPolicyDetail(p: WarrantyPolicy, versions: WarrantyPolicyVersion[], models: PolicyModel[]): PolicyDetailDto {
  const sorted = [...versions].sort((a, b) => a.versionNumber - b.versionNumber);
  const latest = sorted[sorted.length - 1] ?? null;
  return { ...presentPolicy(Object.assign(p, { latest }), models), versions: sorted.map(presentVersion) };
}
