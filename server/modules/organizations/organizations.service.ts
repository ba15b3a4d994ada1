import type { DataSource } from 'typeorm';
import { normalizeAmount, toDecimal } from '../../../shared/credits/money';
import type { UpdateOrganizationInput } from '../../../shared/schemas/organizations';
import type { OrganizationSecurityInput } from '../../../shared/schemas/security';
import { Organization } from '../../db/entities/organization.entity';
import { recordAudit, type Actor } from '../../lib/audit';
import { forbidden } from '../../lib/errors';
import { presentOrganization } from './organizations.presenter';

const dateView = (o: Organization) => ({ timeZone: o.timeZone, locale: o.locale });
const creditView = (o: Organization) => ({
  creditSecondApprovalAbove: presentOrganization(o).creditSecondApprovalAbove,
});

export function createOrganizationsService(ds: DataSource) {
  return {
    findById: (id: string) => ds.getRepository(Organization).findOneBy({ id }),

    /**
     * Changes the organisation's settings in one transaction, each kind audited under its own action: the
     * dates' zone and locale (organization.updated), the credit second approval (organization.settings_changed).
     */
    async update(org: Organization, input: UpdateOrganizationInput, actor: Actor) {
      // The second-approval amount guards a manufacturer's credits; a contractor issues none. (A contractor's
      // administrator may still change the zone and locale.) Refused before anything is written.
      if (input.creditSecondApprovalAbove !== undefined && org.kind !== 'manufacturer')
        throw forbidden('Only a manufacturer sets a second approval for credits.');
      return ds.transaction(async (m) => {
        const patch: Partial<Organization> = {};
        if (input.timeZone !== undefined) patch.timeZone = input.timeZone;
        if (input.locale !== undefined) patch.locale = input.locale;
        if (input.creditSecondApprovalAbove !== undefined)
          patch.creditSecondApprovalAbove =
            input.creditSecondApprovalAbove === null
              ? null
              : normalizeAmount(toDecimal(input.creditSecondApprovalAbove));
        await m.update(Organization, { id: org.id }, patch);
        const after = await m.findOneByOrFail(Organization, { id: org.id });
        const common = { entityType: 'Organization', entityId: org.id } as const;
        if (input.timeZone !== undefined || input.locale !== undefined)
          await recordAudit(m, actor, {
            ...common,
            action: 'organization.updated',
            before: dateView(org),
            after: dateView(after),
          });
        if (input.creditSecondApprovalAbove !== undefined)
          await recordAudit(m, actor, {
            ...common,
            action: 'organization.settings_changed',
            before: creditView(org),
            after: creditView(after),
          });
        return after;
      });
    },

    /** Whether every member needs a second factor; audited only when it changes. */
    async setSecurity(id: string, input: OrganizationSecurityInput, actor: Actor) {
      return ds.transaction(async (m) => {
        const before = await m.findOneOrFail(Organization, {
          where: { id },
          lock: { mode: 'pessimistic_write' },
        });
        if (before.requireSecondFactor !== input.requireSecondFactor) {
          await m.update(Organization, { id }, { requireSecondFactor: input.requireSecondFactor });
          await recordAudit(m, actor, {
            action: 'organization.second_factor_policy_changed',
            entityType: 'Organization',
            entityId: id,
            organizationId: id,
            before: { requireSecondFactor: before.requireSecondFactor },
            after: { requireSecondFactor: input.requireSecondFactor },
          });
        }
        return m.findOneByOrFail(Organization, { id });
      });
    },
  };
}
