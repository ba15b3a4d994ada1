import { Router } from 'express';
import { z } from 'zod';
import type { AppContext } from '../../context';
import { requireUser } from '../../middleware/auth';
import { parseWith } from '../../middleware/validate';
import { createSessionsService } from './sessions.service';

// Any other text is simply no session of theirs (404), like an id that has ended.
const idParam = z.strictObject({ id: z.string().min(1).max(64) });

/** Under /api/auth/sessions: one's own signed-in sessions. Each person sees and ends only their own. */
export function sessionsRouter(ctx: AppContext) {
  const r = Router();
  const service = createSessionsService(ctx);
  r.use(requireUser);

  r.get('/', async (req, res) => {
    res.json({ items: await service.list(req, req.user!) });
  });

  r.post('/sign-out-others', async (req, res) => {
    res.json({ ended: await service.endOthers(req, req.user!) });
  });

  r.delete('/:id', async (req, res) => {
    const { id } = parseWith(idParam, req.params, 'address');
    await service.endOne(req, req.user!, id);
    res.status(204).end();
  });

  return r;
}
