import type { PolicyDetailDto, PolicyDto, PolicyVersionDto } from '../../../shared/schemas/catalogue';
import type { PolicyModel } from '../../db/entities/policy-model.entity';
import type { WarrantyPolicyVersion } from '../../db/entities/warranty-policy-version.entity';
import type { WarrantyPolicy } from '../../db/entities/warranty-policy.entity';
import { orgRef, pick, stamps } from '../../lib/present';

/** The terms: what the answers show and the audit log records (the threshold apart: a decimal column). */
const TERM_FIELDS = [
  'versionNumber',
  'effectiveFrom',
  'termMonths',
  'fullCoverageMonths',
  'filingWindowDays',
  'unitCredit',
  'currency',
  'labourAllowance',
  'requiredPhotos',
  'proofOfPurchaseRequired',
  'exclusions',
  'denialReasons',
  'changeNote',
] as const satisfies readonly (keyof PolicyVersionDto & keyof WarrantyPolicyVersion)[];

export function presentVersion(v: WarrantyPolicyVersion): PolicyVersionDto {
  return {
    id: v.id,
    policyId: v.policyId,
    ...pick(v, TERM_FIELDS),
    darkLedFailurePercent: Number(v.darkLedFailurePercent),
    createdAt: v.createdAt.toISOString(),
  };
}

/** The terms as the audit log records them. */
export function versionAuditView(v: Omit<PolicyVersionDto, 'id' | 'policyId' | 'createdAt'>) {
  return { ...pick(v, TERM_FIELDS), darkLedFailurePercent: v.darkLedFailurePercent };
}

type Loaded = WarrantyPolicy & { latest?: WarrantyPolicyVersion | null };

export function presentPolicy(p: Loaded, models: PolicyModel[]): PolicyDto {
  return {
    id: p.id,
    manufacturer: orgRef(p.manufacturerId, p.manufacturer),
    name: p.name,
    latestVersionNumber: p.latestVersionNumber,
    latestVersion: p.latest ? presentVersion(p.latest) : null,
    models: models
      .filter((m) => m.policyId === p.id)
      .map((m) => ({
        id: m.productModelId,
        modelNumber: m.productModel.modelNumber,
        name: m.productModel.name,
      }))
      .sort((a, b) => a.modelNumber.localeCompare(b.modelNumber)),
    ...stamps(p),
  };
}

export function presentPolicyDetail(
  p: WarrantyPolicy,
  versions: WarrantyPolicyVersion[],
  models: PolicyModel[],
): PolicyDetailDto {
  const sorted = [...versions].sort((a, b) => a.versionNumber - b.versionNumber);
  const latest = sorted[sorted.length - 1] ?? null;
  return { ...presentPolicy(Object.assign(p, { latest }), models), versions: sorted.map(presentVersion) };
}
