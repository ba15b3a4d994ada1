import { Router } from 'express';
import { normalizeAmount, toDecimal } from '../../../shared/credits/money';
import {
  organizationSettingsSchema,
  type OrganizationSettingsDto,
} from '../../../shared/schemas/organizations';
import type { AppContext } from '../../context';
import { Organization } from '../../db/entities/organization.entity';
import { actorFromRequest, recordAudit } from '../../lib/audit';
import { authorize, requireUser } from '../../middleware/auth';
import { parseBody } from '../../middleware/validate';

function present(o: Organization): OrganizationSettingsDto {
  return {
    id: o.id,
    name: o.name,
    kind: o.kind,
    creditSecondApprovalAbove:
      o.creditSecondApprovalAbove === null ? null : normalizeAmount(toDecimal(o.creditSecondApprovalAbove)),
  };
}

/** The signed-in user's own organisation and its settings (the second-approval amount for credits). */
export function organizationsRouter(ctx: AppContext) {
  const r = Router();
  r.use(requireUser);

  r.get('/current', async (req, res) => {
    const org = await ctx.ds.getRepository(Organization).findOneBy({ id: req.user!.organizationId });
    authorize(req, 'read', 'Organization', org, 'organisation');
    res.json({ organization: present(org!) });
  });

  r.patch('/current', async (req, res) => {
    const input = parseBody(organizationSettingsSchema, req);
    const org = await ctx.ds.getRepository(Organization).findOneBy({ id: req.user!.organizationId });
    authorize(req, 'update', 'Organization', org, 'organisation');
    const next =
      input.creditSecondApprovalAbove === null
        ? null
        : normalizeAmount(toDecimal(input.creditSecondApprovalAbove));
    const saved = await ctx.ds.transaction(async (m) => {
      const before = present(org!);
      await m.update(Organization, { id: org!.id }, { creditSecondApprovalAbove: next });
      const after = await m.findOneByOrFail(Organization, { id: org!.id });
      await recordAudit(m, actorFromRequest(req), {
        action: 'organization.settings_changed',
        entityType: 'Organization',
        entityId: org!.id,
        before: { creditSecondApprovalAbove: before.creditSecondApprovalAbove },
        after: { creditSecondApprovalAbove: present(after).creditSecondApprovalAbove },
      });
      return after;
    });
    res.json({ organization: present(saved) });
  });

  return r;
}
