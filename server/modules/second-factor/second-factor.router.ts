import { Router } from 'express';
import { z } from 'zod';
import {
  confirmEnrollmentSchema,
  removeSecondFactorSchema,
  secondFactorLoginSchema,
} from '../../../shared/schemas/security';
import type { AppContext } from '../../context';
import { User } from '../../db/entities/user.entity';
import { authorize, requireUser } from '../../middleware/auth';
import { parseBody, parseWith } from '../../middleware/validate';
import { presentMe } from '../users/users.presenter';
import { createSecondFactorService } from './second-factor.service';

/** Under /api/auth: the sign-in's second step and one's own factor. */
export function secondFactorRouter(ctx: AppContext) {
  const r = Router();
  const service = createSecondFactorService(ctx);

  // No session user yet: the pending sign-in in the session is the credential, with the code.
  r.post('/login/second-factor', async (req, res) => {
    const { code } = parseBody(secondFactorLoginSchema, req);
    const user = await service.completeSignIn(req, code);
    res.json({ user: presentMe(user) });
  });

  r.get('/second-factor', requireUser, async (req, res) => {
    res.json(await service.status(req.user!));
  });

  r.post('/second-factor/enrollment', requireUser, async (req, res) => {
    res.json(await service.startEnrollment(req, req.user!));
  });

  r.post('/second-factor/enrollment/confirm', requireUser, async (req, res) => {
    const { code } = parseBody(confirmEnrollmentSchema, req);
    const recoveryCodes = await service.confirmEnrollment(req, req.user!, code);
    res.json({ recoveryCodes });
  });

  r.delete('/second-factor', requireUser, async (req, res) => {
    const { password } = parseBody(removeSecondFactorSchema, req);
    await service.remove(req, req.user!, password);
    res.status(204).end();
  });

  return r;
}

const idParam = z.strictObject({ id: z.uuid({ error: 'Not a valid id.' }) });

/** Under /api/users: an administrator resets a colleague's factor. */
export function secondFactorResetRouter(ctx: AppContext) {
  const r = Router();
  const service = createSecondFactorService(ctx);

  r.post('/:id/second-factor/reset', requireUser, async (req, res) => {
    const { id } = parseWith(idParam, req.params, 'address');
    const target = await ctx.ds.getRepository(User).findOneBy({ id });
    authorize(req, 'update', 'User', target, 'user');
    await service.reset(req, req.user!, target!);
    res.status(204).end();
  });

  return r;
}
