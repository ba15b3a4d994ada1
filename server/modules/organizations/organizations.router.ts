import { Router, type Request } from 'express';
import { updateOrganizationSchema } from '../../../shared/schemas/organizations';
import { organizationSecuritySchema } from '../../../shared/schemas/security';
import type { AppContext } from '../../context';
import { actorFromRequest } from '../../lib/audit';
import { authorize, requireUser } from '../../middleware/auth';
import { parseBody } from '../../middleware/validate';
import { presentOrganization, presentSecurity } from './organizations.presenter';
import { createOrganizationsService } from './organizations.service';

/**
 * The signed-in person's own organisation and its settings, one route family:
 *   GET|PATCH /api/organizations/current            zone and locale of dates, credit second approval
 *   GET|PATCH /api/organizations/current/security   whether every member needs a second factor
 */
export function organizationsRouter(ctx: AppContext) {
  const r = Router();
  const service = createOrganizationsService(ctx.ds);
  r.use(requireUser);

  const loadCurrent = async (req: Request, action: 'read' | 'update') => {
    const org = await service.findById(req.user!.organizationId);
    authorize(req, action, 'Organization', org, 'organisation');
    return org!;
  };

  r.get('/current', async (req, res) => {
    res.json({ organization: presentOrganization(await loadCurrent(req, 'read')) });
  });

  r.patch('/current', async (req, res) => {
    const input = parseBody(updateOrganizationSchema, req);
    const org = await loadCurrent(req, 'update');
    const updated = await service.update(org, input, actorFromRequest(req));
    res.json({ organization: presentOrganization(updated) });
  });

  r.get('/current/security', async (req, res) => {
    res.json({ organization: presentSecurity(await loadCurrent(req, 'read')) });
  });

  r.patch('/current/security', async (req, res) => {
    const input = parseBody(organizationSecuritySchema, req);
    const org = await loadCurrent(req, 'update');
    const updated = await service.setSecurity(org.id, input, actorFromRequest(req));
    res.json({ organization: presentSecurity(updated) });
  });

  return r;
}
