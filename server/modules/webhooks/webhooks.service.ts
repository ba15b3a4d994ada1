import type { CreateWebhookInput } from '../../../shared/schemas/webhooks';
import type { SessionUser } from '../../auth/passport';
import type { AppDataSource } from '../../db/data-source';
import { WebhookDelivery, WebhookEndpoint } from '../../db/entities/webhook.entity';
import { recordAudit, type Actor } from '../../lib/audit';
import { clock } from '../../lib/clock';
import { conflict } from '../../lib/errors';
import { checkEndpointUrl, enqueueWebhookEvent, newSigningSecret } from '../../lib/webhooks';

export function createWebhooksService(ds: AppDataSource, opts: { strict: boolean }) {
  const endpoints = ds.getRepository(WebhookEndpoint);
  const deliveries = ds.getRepository(WebhookDelivery);
  return {
    list(organizationId: string) {
      return endpoints.find({ where: { organizationId }, order: { createdAt: 'DESC' }, take: 200 });
    },

    findById(id: string) {
      return endpoints.findOneBy({ id });
    },

    findDelivery(endpointId: string, id: string) {
      return deliveries.findOneBy({ endpointId, id });
    },

    deliveriesOf(endpointId: string) {
      return deliveries.find({ where: { endpointId }, order: { id: 'DESC' }, take: 100 });
    },

    /** Registers an endpoint and returns it with its signing secret: the only time the secret is answered. */
    async create(admin: SessionUser, input: CreateWebhookInput, actor: Actor) {
      await checkEndpointUrl(input.url, opts);
      return ds.transaction(async (m) => {
        const endpoint = m.create(WebhookEndpoint, {
          organizationId: admin.organizationId,
          url: input.url,
          events: input.events,
          signingSecret: newSigningSecret(),
          createdById: admin.id,
          disabledAt: null,
        });
        await m.save(endpoint);
        await recordAudit(m, actor, {
          action: 'webhook.created',
          entityType: 'WebhookEndpoint',
          entityId: endpoint.id,
          after: { url: endpoint.url, events: endpoint.events },
        });
        return endpoint;
      });
    },

    /** Stops sending to an endpoint; its delivery log stays. */
    async disable(endpoint: WebhookEndpoint, actor: Actor) {
      if (endpoint.disabledAt) return endpoint;
      return ds.transaction(async (m) => {
        const now = clock.now();
        await m.update(WebhookEndpoint, { id: endpoint.id }, { disabledAt: now });
        await recordAudit(m, actor, {
          action: 'webhook.disabled',
          entityType: 'WebhookEndpoint',
          entityId: endpoint.id,
          before: { disabledAt: null },
          after: { url: endpoint.url, disabledAt: now.toISOString() },
        });
        return m.findOneByOrFail(WebhookEndpoint, { id: endpoint.id });
      });
    },

    /** "Send again": a new delivery of the same event (same event id and body), due now. */
    async resend(endpoint: WebhookEndpoint, delivery: WebhookDelivery, actor: Actor) {
      if (endpoint.disabledAt)
        throw conflict('webhook.disabled', 'This endpoint was removed; nothing is sent to it.');
      return ds.transaction(async (m) => {
        const row = m.create(WebhookDelivery, {
          endpointId: endpoint.id,
          eventId: delivery.eventId,
          event: delivery.event,
          body: delivery.body,
          status: 'pending',
          attempts: 0,
          nextAttemptAt: clock.now(),
        });
        await m.save(row);
        await recordAudit(m, actor, {
          action: 'webhook.resent',
          entityType: 'WebhookEndpoint',
          entityId: endpoint.id,
          after: {
            deliveryId: row.id,
            resends: delivery.id,
            eventId: delivery.eventId,
            event: delivery.event,
          },
        });
        return m.findOneByOrFail(WebhookDelivery, { id: row.id });
      });
    },

    /** A webhook.test event to this endpoint alone, so an integrator can check their receiver. */
    async sendTest(endpoint: WebhookEndpoint, actor: Actor) {
      if (endpoint.disabledAt)
        throw conflict('webhook.disabled', 'This endpoint was removed; nothing is sent to it.');
      return ds.transaction(async (m) => {
        const eventId = await enqueueWebhookEvent(
          m,
          {
            event: 'webhook.test',
            organizationIds: [endpoint.organizationId],
            data: { endpoint: { id: endpoint.id, url: endpoint.url } },
          },
          { endpointId: endpoint.id },
        );
        await recordAudit(m, actor, {
          action: 'webhook.test_sent',
          entityType: 'WebhookEndpoint',
          entityId: endpoint.id,
          after: { eventId },
        });
        return m.findOneByOrFail(WebhookDelivery, { endpointId: endpoint.id, eventId });
      });
    },
  };
}
