import type { DataSource } from 'typeorm';
import type { UpdateOrganizationInput } from '../../../shared/schemas/organizations';
import { Organization } from '../../db/entities/organization.entity';
import { recordAudit, type Actor } from '../../lib/audit';

const auditView = (o: Organization) => ({ timeZone: o.timeZone, locale: o.locale });

export function createOrganizationsService(ds: DataSource) {
  return {
    findById: (id: string) => ds.getRepository(Organization).findOneBy({ id }),

    async update(org: Organization, input: UpdateOrganizationInput, actor: Actor) {
      return ds.transaction(async (m) => {
        const before = auditView(org);
        const patch: Partial<Organization> = {};
        if (input.timeZone !== undefined) patch.timeZone = input.timeZone;
        if (input.locale !== undefined) patch.locale = input.locale;
        await m.update(Organization, { id: org.id }, patch);
        const after = await m.findOneByOrFail(Organization, { id: org.id });
        await recordAudit(m, actor, {
          action: 'organization.updated',
          entityType: 'Organization',
          entityId: org.id,
          before,
          after: auditView(after),
        });
        return after;
      });
    },
  };
}
