import { normalizeAmount, toDecimal } from '../../../shared/credits/money';
import type { OrganizationDto } from '../../../shared/schemas/organizations';
import type { OrganizationSecurityDto } from '../../../shared/schemas/security';
import type { Organization } from '../../db/entities/organization.entity';

export function presentOrganization(o: Organization): OrganizationDto {
  return {
    id: o.id,
    name: o.name,
    kind: o.kind,
    timeZone: o.timeZone,
    locale: o.locale,
    creditSecondApprovalAbove:
      o.creditSecondApprovalAbove === null ? null : normalizeAmount(toDecimal(o.creditSecondApprovalAbove)),
  };
}

export const presentSecurity = (o: Organization): OrganizationSecurityDto => ({
  id: o.id,
  requireSecondFactor: o.requireSecondFactor,
});
