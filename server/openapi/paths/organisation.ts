import { z } from 'zod';
import { apiTokenSchema, createApiTokenSchema } from '../../../shared/schemas/api-tokens';
import { instantSchema, pageSchema } from '../../../shared/schemas/answer-parts';
import { updateOrganizationSchema } from '../../../shared/schemas/organizations';
import { createSavedViewSchema, savedViewFiltersSchema } from '../../../shared/schemas/saved-views';
import {
  organizationSecurityAnswerSchema,
  organizationSecuritySchema,
  securityEventSchema,
  securityEventsQuerySchema,
} from '../../../shared/schemas/security';
import {
  inviteUserSchema,
  updateUserSchema,
  userListQuerySchema,
  userSchema,
} from '../../../shared/schemas/users';
import {
  markWaitingReadSchema,
  WAITING_MAIL_MODES,
  waitingListSchema,
  waitingMailSchema,
} from '../../../shared/schemas/waiting';
import {
  createWebhookSchema,
  webhookDeliverySchema,
  webhookEndpointSchema,
} from '../../../shared/schemas/webhooks';
import { ROLES } from '../../../shared/roles';
import { mailboxMessageSchema } from '../../../shared/schemas/mailbox';
import { itemsOf } from '../answers';
import { op, type Registry } from '../registry';

const organizationSchema = z.object({
  id: z.uuid(),
  name: z.string(),
  kind: z.enum(['manufacturer', 'contractor']),
  timeZone: z.string(),
  locale: z.string(),
  /** Credits above this amount need a second accountant's approval; null: none do. */
  creditSecondApprovalAbove: z.string().nullable(),
});

export function organisationPaths(reg: Registry) {
  const people = 'People and organisation';
  op(reg, {
    method: 'get',
    path: '/api/users',
    tag: people,
    summary: 'The organisation’s people',
    query: userListQuerySchema,
    answer: { json: pageSchema(userSchema) },
  });
  op(reg, {
    method: 'post',
    path: '/api/users/invitations',
    tag: people,
    summary: 'Invite a person (sends the e-mail)',
    body: inviteUserSchema,
    status: 202,
    answer: {
      json: z.object({
        invitation: z.object({ email: z.string(), name: z.string(), roles: z.array(z.enum(ROLES)) }),
      }),
    },
    errors: [409],
  });
  op(reg, {
    method: 'get',
    path: '/api/users/:id',
    tag: people,
    summary: 'One person',
    answer: { json: z.object({ user: userSchema }) },
  });
  op(reg, {
    method: 'patch',
    path: '/api/users/:id',
    tag: people,
    summary: 'Change a person’s name, roles or status',
    body: updateUserSchema,
    answer: { json: z.object({ user: userSchema }) },
    errors: [409],
  });
  op(reg, {
    method: 'post',
    path: '/api/users/:id/second-factor/reset',
    tag: people,
    auth: 'session',
    summary: 'Reset a colleague’s second factor (administrators)',
    status: 204,
    answer: { none: true },
  });
  op(reg, {
    method: 'get',
    path: '/api/organizations/current',
    tag: people,
    summary: 'Your organisation and its settings: time zone, locale, credit second approval',
    answer: { json: z.object({ organization: organizationSchema }) },
  });
  op(reg, {
    method: 'patch',
    path: '/api/organizations/current',
    tag: people,
    summary:
      'Change the time zone, locale or (a manufacturer’s administrators) the credit second-approval amount',
    body: updateOrganizationSchema,
    answer: { json: z.object({ organization: organizationSchema }) },
  });
  op(reg, {
    method: 'get',
    path: '/api/organizations/current/security',
    tag: people,
    summary: 'Whether the organisation requires a second factor',
    answer: { json: z.object({ organization: organizationSecurityAnswerSchema }) },
  });
  op(reg, {
    method: 'patch',
    path: '/api/organizations/current/security',
    tag: people,
    auth: 'session',
    summary: 'Require (or stop requiring) a second factor',
    body: organizationSecuritySchema,
    answer: { json: z.object({ organization: organizationSecurityAnswerSchema }) },
  });
  op(reg, {
    method: 'get',
    path: '/api/security-events',
    tag: people,
    summary: 'Sign-ins, factor changes, token and session events',
    query: securityEventsQuerySchema,
    answer: {
      json: pageSchema(securityEventSchema),
    },
  });

  const integrations = 'Integrations';
  op(reg, {
    method: 'get',
    path: '/api/api-tokens',
    tag: integrations,
    auth: 'session',
    summary: 'The organisation’s API tokens (never their secrets)',
    answer: { json: itemsOf(apiTokenSchema) },
  });
  op(reg, {
    method: 'post',
    path: '/api/api-tokens',
    tag: integrations,
    auth: 'session',
    summary: 'Make an API token; the secret (`lpt_…`) is in this answer only',
    body: createApiTokenSchema,
    status: 201,
    answer: { json: z.object({ apiToken: apiTokenSchema, secret: z.string().startsWith('lpt_') }) },
  });
  op(reg, {
    method: 'delete',
    path: '/api/api-tokens/:id',
    tag: integrations,
    auth: 'session',
    summary: 'Revoke an API token',
    answer: { json: z.object({ apiToken: apiTokenSchema }) },
  });
  op(reg, {
    method: 'get',
    path: '/api/webhooks',
    tag: integrations,
    summary: 'The organisation’s webhook endpoints',
    answer: { json: itemsOf(webhookEndpointSchema) },
  });
  op(reg, {
    method: 'post',
    path: '/api/webhooks',
    tag: integrations,
    summary: 'Register an endpoint; the signing secret is in this answer only',
    description: 'Production refuses endpoints on loopback or private addresses.',
    body: createWebhookSchema,
    status: 201,
    answer: { json: z.object({ webhook: webhookEndpointSchema, signingSecret: z.string() }) },
  });
  op(reg, {
    method: 'delete',
    path: '/api/webhooks/:id',
    tag: integrations,
    summary: 'Turn an endpoint off',
    answer: { json: z.object({ webhook: webhookEndpointSchema }) },
  });
  op(reg, {
    method: 'get',
    path: '/api/webhooks/:id/deliveries',
    tag: integrations,
    summary: 'An endpoint’s delivery log',
    answer: { json: itemsOf(webhookDeliverySchema) },
  });
  op(reg, {
    method: 'post',
    path: '/api/webhooks/:id/test',
    tag: integrations,
    summary: 'Send a `webhook.test` event to the endpoint',
    status: 201,
    answer: { json: z.object({ delivery: webhookDeliverySchema }) },
  });
  op(reg, {
    method: 'post',
    path: '/api/webhooks/:id/deliveries/:deliveryId/resend',
    tag: integrations,
    summary: 'Send a delivery again (same event id, new signature)',
    status: 201,
    answer: { json: z.object({ delivery: webhookDeliverySchema }) },
  });

  const mine = 'What waits on me';
  const savedView = z.object({
    id: z.uuid(),
    name: z.string(),
    filters: savedViewFiltersSchema,
    createdAt: instantSchema,
  });
  op(reg, {
    method: 'get',
    path: '/api/saved-views',
    tag: mine,
    summary: 'Your saved views of the review desk',
    answer: { json: itemsOf(savedView) },
  });
  op(reg, {
    method: 'post',
    path: '/api/saved-views',
    tag: mine,
    summary: 'Save a view of the review desk',
    body: createSavedViewSchema,
    status: 201,
    answer: { json: z.object({ view: savedView }) },
    errors: [409],
  });
  op(reg, {
    method: 'delete',
    path: '/api/saved-views/:id',
    tag: mine,
    summary: 'Delete a saved view',
    status: 204,
    answer: { none: true },
  });
  op(reg, {
    method: 'get',
    path: '/api/waiting',
    tag: mine,
    summary: 'What waits on you (derived from the claims)',
    answer: { json: waitingListSchema },
  });
  op(reg, {
    method: 'post',
    path: '/api/waiting/read',
    tag: mine,
    summary: 'Mark items read',
    body: markWaitingReadSchema,
    answer: { json: z.object({ marked: z.number().int().min(0) }) },
  });
  op(reg, {
    method: 'get',
    path: '/api/waiting/email',
    tag: mine,
    summary: 'How often you are e-mailed about what waits',
    answer: { json: z.object({ mode: z.enum(WAITING_MAIL_MODES) }) },
  });
  op(reg, {
    method: 'put',
    path: '/api/waiting/email',
    tag: mine,
    summary: 'Choose how often you are e-mailed',
    body: waitingMailSchema,
    answer: { json: z.object({ mode: z.enum(WAITING_MAIL_MODES) }) },
  });
  op(reg, {
    method: 'get',
    path: '/api/waiting/unsubscribe/:token',
    tag: mine,
    auth: 'public',
    summary: 'The unsubscribe link of the e-mails (no sign-in)',
    params: z.object({ token: z.string().max(200) }),
    answer: { file: 'text/html', description: 'A short page saying the e-mails have stopped.' },
  });
  op(reg, {
    method: 'get',
    path: '/api/mailbox',
    tag: 'Service',
    summary: 'Demo mode only: the e-mails the demo has sent',
    answer: {
      json: z.object({
        items: z.array(mailboxMessageSchema),
        total: z.number().int(),
        page: z.literal(1),
        pageSize: z.number().int(),
      }),
    },
  });
}
