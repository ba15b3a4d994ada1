import type { Request, RequestHandler } from 'express';
import { z } from 'zod';
import { idempotencyKeySchema } from '../../shared/schemas/credits';
import { AppError } from '../lib/errors';

// The strict schemas live in shared/ so that the forms use the very same rules.

export function zodDetails(error: z.ZodError) {
  return error.issues.map((i) => ({ path: i.path.map(String).join('.') || '(body)', message: i.message }));
}

export function parseWith<S extends z.ZodType>(schema: S, value: unknown, what = 'request'): z.infer<S> {
  const result = schema.safeParse(value);
  if (!result.success) {
    throw new AppError(400, 'validation.failed', `The ${what} has invalid fields.`, zodDetails(result.error));
  }
  return result.data;
}

export function parseBody<S extends z.ZodType>(schema: S, req: Request): z.infer<S> {
  return parseWith(schema, req.body ?? {}, 'request body');
}

export function parseQuery<S extends z.ZodType>(schema: S, req: Request): z.infer<S> {
  return parseWith(schema, req.query ?? {}, 'query');
}

/**
 * The Idempotency-Key header (server/lib/idempotency.ts): required where a repeat would do harm twice (a credit
 * memo), optional where the action is safe to repeat without it (starting a draft, filing). When sent it must be
 * a valid key: a bad one is a 400, never ignored.
 */
export function idempotencyKeyOf(req: Request, opts: { required: true }): string;
export function idempotencyKeyOf(req: Request, opts?: { required?: false }): string | undefined;
export function idempotencyKeyOf(req: Request, opts: { required?: boolean } = {}): string | undefined {
  const value = req.get('idempotency-key');
  if (value === undefined && !opts.required) return undefined;
  return parseWith(
    z.strictObject({ 'idempotency-key': idempotencyKeySchema }),
    { 'idempotency-key': value },
    'Idempotency-Key header',
  )['idempotency-key'];
}

// File uploads (POST …/attachments, and a claim's …/conversation/uploads) are the one place a multipart body is
// let through; the upload middleware parses it there, after the route has authorised the request.
const MULTIPART_ROUTE = /\/(?:attachments|conversation\/uploads)\/?$/;

/** JSON bodies only on JSON routes: a body of any other type is a 415. */
export const requireJsonBody: RequestHandler = (req, _res, next) => {
  const hasBody = Number(req.get('content-length') ?? 0) > 0 || req.get('transfer-encoding') !== undefined;
  if (hasBody && req.method === 'POST' && MULTIPART_ROUTE.test(req.path) && req.is('multipart/form-data'))
    return next();
  if (hasBody && !req.is('application/json')) {
    return next(new AppError(415, 'request.unsupported_media_type', 'Send the body as application/json.'));
  }
  next();
};
