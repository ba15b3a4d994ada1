import { Router } from 'express';
import { z } from 'zod';
import { markWaitingReadSchema, waitingMailSchema } from '../../../shared/schemas/waiting';
import type { AppContext } from '../../context';
import { User } from '../../db/entities/user.entity';
import { authorizeType, requireUser } from '../../middleware/auth';
import { AppError } from '../../lib/errors';
import { parseBody, parseWith } from '../../middleware/validate';
import { mailModeOf, setMailMode, verifyUnsubscribeToken } from './waiting-mail';
import { createWaitingService } from './waiting.service';

/** What waits on the signed-in person, and marking it read. */
export function waitingRouter(ctx: AppContext) {
  const r = Router();
  const service = createWaitingService(ctx.ds);

  // The e-mail's unsubscribe link: no sign-in, the signed token is the credential. Idempotent; answers a short
  // page, since a person opens it from their mail.
  r.get('/unsubscribe/:token', async (req, res) => {
    const { token } = parseWith(z.strictObject({ token: z.string().max(200) }), req.params, 'address');
    const userId = verifyUnsubscribeToken(ctx.config.sessionSecret, token);
    if (!userId || !(await ctx.ds.getRepository(User).existsBy({ id: userId })))
      throw new AppError(404, 'waiting.unsubscribe_invalid', 'This unsubscribe link is not valid.');
    await setMailMode(ctx.ds, userId, 'none');
    res
      .type('html')
      .send(
        '<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Unsubscribed</title></head><body>' +
          '<main><h1>No more e-mail about what waits on you</h1><p>You can turn it back on in Lumenproof, ' +
          'on the Waiting on you page.</p></main></body></html>',
      );
  });

  r.use(requireUser);

  r.get('/email', async (req, res) => {
    authorizeType(req, 'read', 'Waiting');
    res.json({ mode: await mailModeOf(ctx.ds, req.user!.id) });
  });

  r.put('/email', async (req, res) => {
    const input = parseBody(waitingMailSchema, req);
    authorizeType(req, 'update', 'Waiting');
    await setMailMode(ctx.ds, req.user!.id, input.mode);
    res.json({ mode: input.mode });
  });

  r.get('/', async (req, res) => {
    authorizeType(req, 'read', 'Waiting');
    res.json(await service.list(req.user!));
  });

  r.post('/read', async (req, res) => {
    const input = parseBody(markWaitingReadSchema, req);
    authorizeType(req, 'update', 'Waiting');
    const marked = await service.markRead(req.user!, input.keys);
    res.json({ marked });
  });

  return r;
}
