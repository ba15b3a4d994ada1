import { Router } from 'express';
import { z } from 'zod';
import { createApiTokenSchema } from '../../../shared/schemas/api-tokens';
import type { AppContext } from '../../context';
import { actorFromRequest } from '../../lib/audit';
import { authorize, authorizeNew, authorizeType, requireUser } from '../../middleware/auth';
import { parseBody, parseWith } from '../../middleware/validate';
import { presentApiToken } from './api-tokens.presenter';
import { createApiTokensService } from './api-tokens.service';

const idParam = z.strictObject({ id: z.uuid({ error: 'Not a valid id.' }) });

export function apiTokensRouter(ctx: AppContext) {
  const r = Router();
  const service = createApiTokensService(ctx.ds);
  r.use(requireUser);

  r.get('/', async (req, res) => {
    authorizeType(req, 'read', 'ApiToken');
    const items = await service.list(req.user!.organizationId);
    res.json({ items: items.map(presentApiToken) });
  });

  r.post('/', async (req, res) => {
    const input = parseBody(createApiTokenSchema, req);
    authorizeNew(req, 'create', 'ApiToken', { organizationId: req.user!.organizationId });
    const { token, secret } = await service.create(req.user!, input, actorFromRequest(req));
    res.status(201).json({ apiToken: presentApiToken(token), secret });
  });

  r.delete('/:id', async (req, res) => {
    const { id } = parseWith(idParam, req.params, 'address');
    const token = await service.findById(id);
    authorize(req, 'delete', 'ApiToken', token, 'API token');
    const revoked = await service.revoke(req.user!, token!, actorFromRequest(req));
    res.json({ apiToken: presentApiToken(revoked) });
  });

  return r;
}
