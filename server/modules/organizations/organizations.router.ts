import { Router } from 'express';
import { z } from 'zod';
import { normalizeAmount, toDecimal } from '../../../shared/credits/money';
import {
  organizationSettingsSchema,
  type OrganizationSettingsDto,
} from '../../../shared/schemas/organizations';
import { organizationSecuritySchema } from '../../../shared/schemas/security';
import type { AppContext } from '../../context';
import { Organization } from '../../db/entities/organization.entity';
import { actorFromRequest, recordAudit } from '../../lib/audit';
import { forbidden } from '../../lib/errors';
import { authorize, requireUser } from '../../middleware/auth';
import { parseBody, parseWith } from '../../middleware/validate';

const idParam = z.strictObject({ id: z.uuid({ error: 'Not a valid id.' }) });
const presentSecurity = (o: Organization) => ({ id: o.id, requireSecondFactor: o.requireSecondFactor });

function present(o: Organization): OrganizationSettingsDto {
  return {
    id: o.id,
    name: o.name,
    kind: o.kind,
    creditSecondApprovalAbove:
      o.creditSecondApprovalAbove === null ? null : normalizeAmount(toDecimal(o.creditSecondApprovalAbove)),
  };
}

/**
 * The signed-in user's own organisation and its settings (the second-approval amount for credits), and an
 * organisation's security settings (whether every member needs a second factor).
 */
export function organizationsRouter(ctx: AppContext) {
  const r = Router();
  const orgs = ctx.ds.getRepository(Organization);
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
    // The second-approval amount guards a manufacturer's credits; a contractor issues none. (A contractor's
    // administrator may update the organisation's other settings, its time zone and locale.)
    if (org.kind !== 'manufacturer')
      throw forbidden('Only a manufacturer sets a second approval for credits.');
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

  r.get('/:id/security', async (req, res) => {
    const { id } = parseWith(idParam, req.params, 'address');
    const org = await orgs.findOneBy({ id });
    authorize(req, 'read', 'Organization', org, 'organisation');
    res.json({ organization: presentSecurity(org!) });
  });

  r.patch('/:id/security', async (req, res) => {
    const { id } = parseWith(idParam, req.params, 'address');
    const input = parseBody(organizationSecuritySchema, req);
    const org = await orgs.findOneBy({ id });
    authorize(req, 'update', 'Organization', org, 'organisation');
    const updated = await ctx.ds.transaction(async (m) => {
      const before = await m.findOneOrFail(Organization, {
        where: { id },
        lock: { mode: 'pessimistic_write' },
      });
      if (before.requireSecondFactor !== input.requireSecondFactor) {
        await m.update(Organization, { id }, { requireSecondFactor: input.requireSecondFactor });
        await recordAudit(m, actorFromRequest(req), {
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
    res.json({ organization: presentSecurity(updated) });
  });

  return r;
}
