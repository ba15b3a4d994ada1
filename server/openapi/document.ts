import crypto from 'node:crypto';
import { OpenApiGeneratorV31 } from '@asteasolutions/zod-to-openapi';
import { z } from 'zod';
import {
  WEBHOOK_EVENT_LABELS,
  WEBHOOK_EVENTS,
  WEBHOOK_SIGNATURE_HEADER,
  webhookBodySchema,
} from '../../shared/schemas/webhooks';
import { analyticsPaths } from './paths/analytics';
import { authPaths } from './paths/auth';
import { cataloguePaths } from './paths/catalogue';
import { claimPaths } from './paths/claims';
import { creditPaths } from './paths/credits';
import { organisationPaths } from './paths/organisation';
import { createRegistry, type Registry } from './registry';

export const OPENAPI_PATH = '/api/openapi.json';

const SIGNATURE_TEXT =
  '`t=<unix seconds>,v1=<hex HMAC-SHA256>` over `"<t>.<raw body>"` under the endpoint’s signing secret ' +
  '(shown once, when the endpoint is registered). Recompute it over the raw bytes, compare in constant time, and ' +
  'refuse a `t` more than five minutes from your clock.';

function webhooks(reg: Registry) {
  for (const event of [...WEBHOOK_EVENTS, 'webhook.test' as const]) {
    reg.registerWebhook({
      method: 'post',
      path: event,
      operationId: `webhook_${event.replace(/\W/g, '_')}`,
      summary: event === 'webhook.test' ? 'Test delivery (“Send a test”)' : WEBHOOK_EVENT_LABELS[event],
      description: `Lumenproof POSTs this to each endpoint that asked for \`${event}\`. ${SIGNATURE_TEXT} Answer any 2xx; anything else (or no answer in 10 s) is retried with backoff.`,
      tags: ['Webhooks'],
      request: {
        headers: z.object({
          [WEBHOOK_SIGNATURE_HEADER]: z
            .string()
            .regex(/^t=\d+,v1=[0-9a-f]{64}$/)
            .meta({
              description: SIGNATURE_TEXT,
              example: 't=1796300000,v1=5d41402abc4b2a76b9719d911017c592…',
            }),
          'Lumenproof-Event': z.literal(event).meta({ description: 'The event’s type, as in the body.' }),
          'Lumenproof-Event-Id': z
            .uuid()
            .meta({ description: 'The same on every retry and on “Send again”.' }),
          'Lumenproof-Delivery': z.uuid().meta({ description: 'This delivery (one endpoint, one event).' }),
        }),
        body: { required: true, content: { 'application/json': { schema: webhookBodySchema(event) } } },
      },
      responses: { 200: { description: 'Received (any 2xx).' } },
    });
  }
}

/** The whole document, built from the zod schemas. */
export function buildOpenApiDocument() {
  const reg = createRegistry();
  authPaths(reg);
  organisationPaths(reg);
  cataloguePaths(reg);
  claimPaths(reg);
  creditPaths(reg);
  analyticsPaths(reg);
  webhooks(reg);
  return new OpenApiGeneratorV31(reg.definitions, { sortComponents: 'alphabetically' }).generateDocument({
    openapi: '3.1.0',
    info: {
      title: 'Lumenproof API',
      version: '1',
      description:
        'Warranty and return claims for commercial LED lighting. Every route answers JSON under `/api`, refusals ' +
        'as `{ "error": { "code", "message", "details"? } }`. Sign in with the session cookie, or send an API token ' +
        '(`Authorization: Bearer lpt_…`) that an administrator made under Integrations. A record of another ' +
        'organisation answers 404, exactly like a missing one. Lists take `page`, `pageSize`, `sort` and `q`.',
    },
    servers: [{ url: '/' }],
    tags: [
      { name: 'Claims' },
      { name: 'Review desk' },
      { name: 'Credits and accounting' },
      { name: 'Products, policies, installations' },
      { name: 'Reliability and reserve' },
      { name: 'Integrations' },
      { name: 'People and organisation' },
      { name: 'What waits on me' },
      { name: 'Sign-in and account' },
      { name: 'Service' },
      {
        name: 'Webhooks',
        description: `Deliveries Lumenproof sends, signed in the \`${WEBHOOK_SIGNATURE_HEADER}\` header.`,
      },
    ],
  });
}

let cached: { body: string; etag: string } | undefined;

/** The document as served: built once per process, with its validator. */
export function servedOpenApiDocument() {
  if (!cached) {
    const body = JSON.stringify(buildOpenApiDocument());
    cached = { body, etag: `"${crypto.createHash('sha256').update(body).digest('base64url').slice(0, 27)}"` };
  }
  return cached;
}
