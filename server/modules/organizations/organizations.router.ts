import { Router } from 'express';
import { z } from 'zod';
import { organizationSecuritySchema } from '../../../shared/schemas/security';
import type { AppContext } from '../../context';
import { Organization } from '../../db/entities/organization.entity';
import { actorFromRequest, recordAudit } from '../../lib/audit';
import { authorize, requireUser } from '../../middleware/auth';
import { parseBody, parseWith } from '../../middleware/validate';

const idParam = z.strictObject({ id: z.uuid({ error: 'Not a valid id.' }) });
const present = (o: Organization) => ({ id: o.id, requireSecondFactor: o.requireSecondFactor });

/** An organisation's security settings: whether every member needs a second factor. */
export function organizationsRouter(ctx: AppContext) {
  const r = Router();
  const orgs = ctx.ds.getRepository(Organization);
  r.use(requireUser);

  r.get('/:id/security', async (req, res) => {
    const { id } = parseWith(idParam, req.params, 'address');
    const org = await orgs.findOneBy({ id });
    authorize(req, 'read', 'Organization', org, 'organisation');
    res.json({ organization: present(org!) });
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
    res.json({ organization: present(updated) });
  });

  return r;
}
