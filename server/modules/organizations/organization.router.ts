import { Router } from 'express';
import { updateOrganizationSchema } from '../../../shared/schemas/organizations';
import type { AppContext } from '../../context';
import { actorFromRequest } from '../../lib/audit';
import { authorize, requireUser } from '../../middleware/auth';
import { parseBody } from '../../middleware/validate';
import { presentOrganization } from './organizations.presenter';
import { createOrganizationsService } from './organizations.service';

/** The signed-in person's own organisation: its settings (the zone and locale every date is shown in). */
export function organizationRouter(ctx: AppContext) {
  const r = Router();
  const service = createOrganizationsService(ctx.ds);
  r.use(requireUser);

  r.get('/', async (req, res) => {
    const org = await service.findById(req.user!.organizationId);
    authorize(req, 'read', 'Organization', org, 'organization');
    res.json({ organization: presentOrganization(org!) });
  });

  r.patch('/', async (req, res) => {
    const input = parseBody(updateOrganizationSchema, req);
    const org = await service.findById(req.user!.organizationId);
    authorize(req, 'update', 'Organization', org, 'organization');
    const updated = await service.update(org!, input, actorFromRequest(req));
    res.json({ organization: presentOrganization(updated) });
  });

  return r;
}
