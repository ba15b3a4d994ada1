import { Router } from 'express';
import { z } from 'zod';
import { inviteUserSchema, updateUserSchema, userListQuerySchema } from '../../../shared/schemas/users';
import type { AppContext } from '../../context';
import { actorFromRequest, auditRefusal } from '../../lib/audit';
import { pageOf } from '../../lib/pagination';
import { authorize, authorizeType, requireUser } from '../../middleware/auth';
import { parseBody, parseQuery, parseWith } from '../../middleware/validate';
import { presentUser } from './users.presenter';
import { createUsersService } from './users.service';

const idParam = z.strictObject({ id: z.uuid({ error: 'Not a valid id.' }) });

export function usersRouter(ctx: AppContext) {
  const r = Router();
  const service = createUsersService(ctx.ds, { publicUrl: ctx.publicUrl });
  r.use(requireUser);

  r.get('/', async (req, res) => {
    authorizeType(req, 'invite', 'User');
    const q = parseQuery(userListQuerySchema, req);
    const { items, total } = await service.list(req.user!.organizationId, q);
    res.json(pageOf(items.map(presentUser), total, q));
  });

  r.post('/invitations', async (req, res) => {
    const input = parseBody(inviteUserSchema, req);
    authorizeType(req, 'invite', 'User');
    await service.invite(req.user!, input, actorFromRequest(req));
    // The same answer whether or not the address has an account elsewhere (users.service.ts, invite).
    res.status(202).json({ invitation: { email: input.email, name: input.name, roles: input.roles } });
  });

  r.get('/:id', async (req, res) => {
    const { id } = parseWith(idParam, req.params, 'address');
    const user = await service.findById(id);
    authorize(req, 'read', 'User', user, 'user');
    res.json({ user: presentUser(user!) });
  });

  r.patch('/:id', async (req, res) => {
    const { id } = parseWith(idParam, req.params, 'address');
    const input = parseBody(updateUserSchema, req);
    const user = await service.findById(id);
    authorize(req, input.status === 'disabled' ? 'disable' : 'update', 'User', user, 'user');
    const actor = actorFromRequest(req);
    const updated = await service
      .update(req.user!, user!, input, actor)
      .catch((e) => auditRefusal(ctx.ds, actor, e));
    res.json({ user: presentUser(updated) });
  });

  return r;
}
