import type { WebhookDeliveryView, WebhookEndpointView } from '../../../shared/schemas/webhooks';
import type { WebhookDelivery, WebhookEndpoint } from '../../db/entities/webhook.entity';

const iso = (d: Date | null) => (d ? d.toISOString() : null);

/** Never the signing secret: that is answered once, by the route that makes it. */
export function presentWebhook(e: WebhookEndpoint): WebhookEndpointView {
  return {
    id: e.id,
    url: e.url,
    events: e.events,
    createdAt: e.createdAt.toISOString(),
    disabledAt: iso(e.disabledAt),
  };
}

export function presentDelivery(d: WebhookDelivery): WebhookDeliveryView {
  return {
    id: d.id,
    eventId: d.eventId,
    event: d.event,
    status: d.status,
    attempts: d.attempts,
    lastStatusCode: d.lastStatusCode,
    lastError: d.lastError,
    lastAttemptAt: iso(d.lastAttemptAt),
    deliveredAt: iso(d.deliveredAt),
    createdAt: d.createdAt.toISOString(),
  };
}
