import type { OrganizationDto } from '../../../shared/schemas/organizations';
import type { Organization } from '../../db/entities/organization.entity';

export function presentOrganization(o: Organization): OrganizationDto {
  return { id: o.id, name: o.name, kind: o.kind, timeZone: o.timeZone, locale: o.locale };
}
