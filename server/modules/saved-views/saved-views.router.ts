import { Router } from 'express';
import { z } from 'zod';
import { createSavedViewSchema } from '../../../shared/schemas/saved-views';
import type { AppContext } from '../../context';
import { actorFromRequest } from '../../lib/audit';
import { authorize, authorizeType, requireUser } from '../../middleware/auth';
import { parseBody, parseWith } from '../../middleware/validate';
import { presentSavedView } from './saved-views.presenter';
import { createSavedViewsService } from './saved-views.service';

const idParam = z.strictObject({ id: z.uuid({ error: 'Not a valid id.' }) });

/** The signed-in person's own saved review-desk views. */
export function savedViewsRouter(ctx: AppContext) {
  const r = Router();
  const service = createSavedViewsService(ctx.ds);
  r.use(requireUser);

  r.get('/', async (req, res) => {
    authorizeType(req, 'read', 'SavedView');
    const views = await service.listFor(req.user!.id);
    res.json({ items: views.map(presentSavedView) });
  });

  r.post('/', async (req, res) => {
    const input = parseBody(createSavedViewSchema, req);
    authorizeType(req, 'create', 'SavedView');
    const view = await service.create(req.user!.id, input, actorFromRequest(req));
    res.status(201).json({ view: presentSavedView(view) });
  });

  r.delete('/:id', async (req, res) => {
    const { id } = parseWith(idParam, req.params, 'address');
    const view = await service.findById(id);
    authorize(req, 'delete', 'SavedView', view, 'saved view');
    await service.remove(view!, actorFromRequest(req));
    res.status(204).end();
  });

  return r;
}
