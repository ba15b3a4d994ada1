import { engineContextFrom, engineInputFor, type ClaimEvidence } from '../../../shared/claims/engine-input';
import type { ClaimEngineContext, ClaimFields } from '../../../shared/schemas/claims';
import type { Claim } from '../../db/entities/claim.entity';
import type { Installation } from '../../db/entities/installation.entity';
import type { ProductModel } from '../../db/entities/product-model.entity';
import type { WarrantyPolicyVersion } from '../../db/entities/warranty-policy-version.entity';

// The server's side of the engine input: the loaded records into the shared mapping, which the claim form's
// live evaluation uses too (shared/claims/engine-input.ts). Nothing else builds engine input for a claim.

export function engineContextOf(
  product: ProductModel,
  version: WarrantyPolicyVersion | null,
  installation: Installation,
): ClaimEngineContext {
  return engineContextFrom(product, version, installation);
}

export function claimFieldsOf(c: Claim): ClaimFields {
  return {
    serials: c.serials,
    units: c.units ?? undefined,
    failedOn: c.failedOn,
    symptoms: c.symptoms,
    measurements: c.measurements,
    observations: c.observations,
    narrative: c.narrative,
  };
}

export function engineInputOfClaim(
  c: Claim & {
    productModel: ProductModel;
    installation: Installation;
    policyVersion: WarrantyPolicyVersion | null;
  },
  evidence: ClaimEvidence,
  filedOn: string,
) {
  return engineInputFor(
    engineContextOf(c.productModel, c.policyVersion, c.installation),
    claimFieldsOf(c),
    evidence,
    filedOn,
  );
}
