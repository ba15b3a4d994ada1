import { Router } from 'express';
import { markWaitingReadSchema } from '../../../shared/schemas/waiting';
import type { AppContext } from '../../context';
import { authorizeType, requireUser } from '../../middleware/auth';
import { parseBody } from '../../middleware/validate';
import { createWaitingService } from './waiting.service';

/** What waits on the signed-in person, and marking it read. */
export function waitingRouter(ctx: AppContext) {
  const r = Router();
  const service = createWaitingService(ctx.ds);
  r.use(requireUser);

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
