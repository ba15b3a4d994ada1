import { queryOptions } from '@tanstack/react-query';
import type { ApiTokenView, CreateApiTokenInput } from '../../../../shared/schemas/api-tokens';
import type {
  CreateWebhookInput,
  WebhookDeliveryView,
  WebhookEndpointView,
} from '../../../../shared/schemas/webhooks';
import { api } from '../../../lib/api-client';

export const integrationQueries = {
  tokens: ['api-tokens'] as const,
  webhooks: ['webhooks'] as const,
  tokenList: () =>
    queryOptions({
      queryKey: ['api-tokens', 'list'],
      queryFn: () => api<{ items: ApiTokenView[] }>('/api-tokens'),
    }),
  webhookList: () =>
    queryOptions({
      queryKey: ['webhooks', 'list'],
      queryFn: () => api<{ items: WebhookEndpointView[] }>('/webhooks'),
    }),
  deliveries: (id: string) =>
    queryOptions({
      queryKey: ['webhooks', 'deliveries', id],
      queryFn: () => api<{ items: WebhookDeliveryView[] }>(`/webhooks/${encodeURIComponent(id)}/deliveries`),
    }),
};

export const createApiToken = (input: CreateApiTokenInput) =>
  api<{ apiToken: ApiTokenView; secret: string }>('/api-tokens', { method: 'POST', json: input });

export const revokeApiToken = (id: string) =>
  api<{ apiToken: ApiTokenView }>(`/api-tokens/${encodeURIComponent(id)}`, { method: 'DELETE' });

export const registerWebhook = (input: CreateWebhookInput) =>
  api<{ webhook: WebhookEndpointView; signingSecret: string }>('/webhooks', { method: 'POST', json: input });

export const removeWebhook = (id: string) =>
  api<{ webhook: WebhookEndpointView }>(`/webhooks/${encodeURIComponent(id)}`, { method: 'DELETE' });

export const sendTestEvent = (id: string) =>
  api<{ delivery: WebhookDeliveryView }>(`/webhooks/${encodeURIComponent(id)}/test`, {
    method: 'POST',
    json: {},
  });

export const resendDelivery = (id: string, deliveryId: string) =>
  api<{ delivery: WebhookDeliveryView }>(
    `/webhooks/${encodeURIComponent(id)}/deliveries/${encodeURIComponent(deliveryId)}/resend`,
    { method: 'POST', json: {} },
  );
