import { OpenAPIRegistry, type RouteConfig } from '@asteasolutions/zod-to-openapi';
import { z } from 'zod';
import { idempotencyKeySchema } from '../../shared/schemas/credits';
import { SESSION_COOKIE } from '../auth/session';

// The OpenAPI document is generated from the zod schemas in shared/ (the same ones the routes validate with)
// by @asteasolutions/zod-to-openapi. Each module describes its routes in paths/<module>.ts with `op()`; the test
// tests/server/openapi.test.ts holds the list against listRoutes(app).

export type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';
type Status = 200 | 201 | 202 | 204;

/** What a route answers on success: JSON with a schema, a file of a media type, or nothing (204). */
export type Answer =
  | {
      json: z.ZodType;
      description?: string;
      /** Also answers this file type (a `format` parameter picks). */ or?: string;
    }
  | { file: string; description: string }
  | { none: true; description?: string };

export type Op = {
  method: Method;
  /** Express style, with the /api prefix: `/api/claims/:id`. */
  path: string;
  summary: string;
  description?: string;
  tag: string;
  /** `public`: no sign-in; `session`: a signed-in person only (API tokens are refused); default: either. */
  auth?: 'public' | 'session' | 'any';
  /** The path's parameters; every `:name` not given here is documented as a UUID. */
  params?: z.ZodObject;
  query?: z.ZodType;
  body?: z.ZodType;
  /** A multipart/form-data upload: the file part plus these text fields. */
  multipart?: z.ZodObject;
  idempotencyKey?: 'optional' | 'required';
  ifMatch?: boolean;
  status?: Status;
  /** Another success status the route may answer with the same shape (a dry run's 200 beside a 201). */
  alsoStatus?: Status;
  /** The other status's answer when it differs. */
  alsoAnswer?: Answer;
  answer: Answer;
  /** The refusals beyond those every route shares (400, 401, 403, 404, 429). */
  errors?: number[];
};

export const ERROR_STATUS_TEXT: Record<number, string> = {
  400: 'Bad input: `details` lists each bad field by path.',
  401: 'Not signed in, or the API token is unknown, expired or revoked.',
  403: 'Signed in, not allowed; or a state-changing request from a foreign origin.',
  404: 'Missing, or belongs to another organisation: the two look the same.',
  409: 'Conflicts with the record as it is now (for a claim: moved on, or a stale If-Match).',
  413: 'The body is too large.',
  415: 'Not a JSON body (or not the multipart upload the route takes).',
  422: 'The Idempotency-Key was used before with another body.',
  429: 'Too many requests; wait for the seconds in Retry-After.',
  503: 'The database is not answering.',
};

export const errorSchema = z
  .object({
    error: z.object({
      code: z
        .string()
        .meta({ description: 'Stable, dotted: `claim.invalid_transition`.', example: 'not_found' }),
      message: z.string().meta({ description: 'Plain words for a person.' }),
      details: z
        .array(z.object({ path: z.string(), message: z.string() }).loose())
        .optional()
        .meta({ description: 'On a 400: each bad field by its path.' }),
      requestId: z.string().optional().meta({ description: 'On a 500: the id to quote to support.' }),
    }),
  })
  .meta({ id: 'Error', description: 'Every refusal has this shape (API.md).' });

export function createRegistry() {
  const registry = new OpenAPIRegistry();
  registry.registerComponent('securitySchemes', 'session', {
    type: 'apiKey',
    in: 'cookie',
    name: SESSION_COOKIE,
    description:
      'The session cookie `POST /api/auth/login` sets (HttpOnly, SameSite=Lax). State-changing requests must ' +
      'come from the app’s own origin or carry no Origin header.',
  });
  registry.registerComponent('securitySchemes', 'apiToken', {
    type: 'http',
    scheme: 'bearer',
    bearerFormat: 'lpt_…',
    description:
      'An API token an administrator made under Integrations (`Authorization: Bearer lpt_…`). It acts with the ' +
      'roles it was given, within its organisation, under the same rules as a person; every use is audited.',
  });
  return registry;
}

export type Registry = ReturnType<typeof createRegistry>;

/** `/api/claims/:id` → `/api/claims/{id}`. */
export const openApiPath = (expressPath: string) => expressPath.replace(/:([A-Za-z0-9_]+)/g, '{$1}');

const idempotencyHeader = (required: boolean) =>
  z.object({
    'Idempotency-Key': (required ? idempotencyKeySchema : idempotencyKeySchema.optional()).meta({
      description:
        'One key per attempt (a UUID fits; 8-255 printable characters). The same key replays the first answer ' +
        '(`Idempotent-Replayed: true`); the same key with another body is a 422. Kept 30 days.',
    }),
  });

const ifMatchHeader = z.object({
  'If-Match': z
    .string()
    .regex(/^(W\/)?"?\d+"?$/)
    .optional()
    .meta({ description: 'The claim’s `version` as last read, like `"7"`: a claim changed since is a 409.' }),
});

function jsonErrors(statuses: number[]) {
  return Object.fromEntries(
    statuses.map((s) => [
      s,
      {
        description: ERROR_STATUS_TEXT[s] ?? 'Refused.',
        content: { 'application/json': { schema: errorSchema } },
      },
    ]),
  );
}

function success(a: Answer) {
  if ('json' in a)
    return {
      description: a.description ?? 'Done.',
      content: {
        'application/json': { schema: a.json },
        ...(a.or ? { [a.or]: { schema: { type: 'string' as const } } } : {}),
      },
    };
  if ('file' in a)
    return {
      description: a.description,
      content: { [a.file]: { schema: { type: 'string' as const, contentEncoding: 'binary' } } },
    };
  return { description: a.description ?? 'Done; no body.' };
}

/** Registers one route. */
export function op(registry: Registry, o: Op) {
  const names = [...o.path.matchAll(/:([A-Za-z0-9_]+)/g)].map((m) => m[1]!);
  const given = o.params?.shape ?? {};
  const params = names.length
    ? z.object(Object.fromEntries(names.map((n) => [n, (given as Record<string, z.ZodType>)[n] ?? z.uuid()])))
    : undefined;
  const headers = [
    ...(o.idempotencyKey ? [idempotencyHeader(o.idempotencyKey === 'required')] : []),
    ...(o.ifMatch ? [ifMatchHeader] : []),
  ];
  const auth = o.auth ?? 'any';
  const errors = new Set<number>([
    ...(o.body || o.query || o.multipart || names.length || o.idempotencyKey ? [400] : []),
    ...(auth === 'public' ? [] : [401, 403]),
    ...(names.length ? [404] : []),
    ...(o.idempotencyKey ? [422] : []),
    ...(o.ifMatch ? [409] : []),
    ...(o.body ? [413, 415] : []),
    ...(o.multipart ? [413, 415] : []),
    429,
    ...(o.errors ?? []),
  ]);
  const status = o.status ?? 200;
  const responses: RouteConfig['responses'] = { [status]: success(o.answer) };
  if (o.alsoStatus) responses[o.alsoStatus] = success(o.alsoAnswer ?? o.answer);
  Object.assign(responses, jsonErrors([...errors].sort()));
  const body = o.body
    ? { required: true, content: { 'application/json': { schema: o.body } } }
    : o.multipart
      ? {
          required: true,
          content: {
            'multipart/form-data': {
              schema: o.multipart.extend({ file: z.string().meta({ format: 'binary' }) }),
            },
          },
        }
      : undefined;
  registry.registerPath({
    method: o.method,
    path: openApiPath(o.path),
    operationId: operationId(o.method, o.path),
    summary: o.summary,
    ...(o.description ? { description: o.description } : {}),
    tags: [o.tag],
    security:
      auth === 'public' ? [] : auth === 'session' ? [{ session: [] }] : [{ session: [] }, { apiToken: [] }],
    request: {
      ...(params ? { params } : {}),
      ...(o.query ? { query: o.query as z.ZodObject } : {}),
      ...(headers.length ? { headers } : {}),
      ...(body ? { body } : {}),
    },
    responses,
  });
}

/** `get /api/claims/:id/workflow` → `get_claims_id_workflow`: stable, readable, unique per route. */
export function operationId(method: string, path: string) {
  return `${method}_${path
    .replace(/^\/api\//, '')
    .replace(/[:.]/g, '')
    .replace(/[^A-Za-z0-9]+/g, '_')}`;
}
