import { Router, type Request } from 'express';
import { z } from 'zod';
import { createWebhookSchema } from '../../../shared/schemas/webhooks';
import type { AppContext } from '../../context';
import { actorFromRequest } from '../../lib/audit';
import { notFound } from '../../lib/errors';
import { authorize, authorizeNew, authorizeType, requireUser } from '../../middleware/auth';
import { parseBody, parseWith } from '../../middleware/validate';
import { presentDelivery, presentWebhook } from './webhooks.presenter';
import { createWebhooksService } from './webhooks.service';

const idParam = z.strictObject({ id: z.uuid({ error: 'Not a valid id.' }) });

export function webhooksRouter(ctx: AppContext) {
  const r = Router();
  const service = createWebhooksService(ctx.ds, { strict: ctx.config.mode === 'production' });
  r.use(requireUser);

  const load = async (req: Request, action: 'read' | 'update' | 'delete') => {
    const { id } = parseWith(idParam, { id: req.params.id }, 'address');
    const endpoint = await service.findById(id);
    authorize(req, action, 'Webhook', endpoint, 'webhook');
    return endpoint!;
  };

  r.get('/', async (req, res) => {
    authorizeType(req, 'read', 'Webhook');
    const items = await service.list(req.user!.organizationId);
    res.json({ items: items.map(presentWebhook) });
  });

  r.post('/', async (req, res) => {
    const input = parseBody(createWebhookSchema, req);
    authorizeNew(req, 'create', 'Webhook', { organizationId: req.user!.organizationId });
    const endpoint = await service.create(req.user!, input, actorFromRequest(req));
    res.status(201).json({ webhook: presentWebhook(endpoint), signingSecret: endpoint.signingSecret });
  });

  r.delete('/:id', async (req, res) => {
    const endpoint = await load(req, 'delete');
    res.json({ webhook: presentWebhook(await service.disable(endpoint, actorFromRequest(req))) });
  });

  r.get('/:id/deliveries', async (req, res) => {
    const endpoint = await load(req, 'read');
    res.json({ items: (await service.deliveriesOf(endpoint.id)).map(presentDelivery) });
  });

  r.post('/:id/test', async (req, res) => {
    const endpoint = await load(req, 'update');
    res
      .status(201)
      .json({ delivery: presentDelivery(await service.sendTest(endpoint, actorFromRequest(req))) });
  });

  r.post('/:id/deliveries/:deliveryId/resend', async (req, res) => {
    const endpoint = await load(req, 'update');
    // Delivery ids are numbers; anything else is simply not one of them.
    const deliveryId = String(req.params.deliveryId);
    const delivery = /^\d{1,19}$/.test(deliveryId)
      ? await service.findDelivery(endpoint.id, deliveryId)
      : null;
    if (!delivery) throw notFound('delivery');
    const again = await service.resend(endpoint, delivery, actorFromRequest(req));
    res.status(201).json({ delivery: presentDelivery(again) });
  });

  return r;
}
