import type { ErrorRequestHandler } from 'express';
import { ZodError } from 'zod';
import { AnalyticsInputError } from '../../shared/analytics/validation';
import { AppError } from '../lib/errors';
import { zodDetails } from './validate';

type HttpishError = Error & { status?: number; statusCode?: number; type?: string; expose?: boolean };

// Last in the chain: every error becomes { error: { code, message, details? } }. Unknown errors are a 500 with a
// generic message and the request id; the stack goes to the log only.
export const errorHandler: ErrorRequestHandler = (err: HttpishError, req, res, _next) => {
  void _next;
  let status = 500;
  let body: { code: string; message: string; details?: unknown; requestId?: string };

  if (err instanceof AppError) {
    status = err.status;
    body = { code: err.code, message: err.message, ...(err.details ? { details: err.details } : {}) };
    if (err.headers) res.set(err.headers);
  } else if (err instanceof ZodError) {
    status = 400;
    body = {
      code: 'validation.failed',
      message: 'The request has invalid fields.',
      details: zodDetails(err),
    };
  } else if (err instanceof AnalyticsInputError) {
    // Input a reliability computation refused (a NaN term, a null life-data entry): the field, not a 500.
    status = 400;
    body = {
      code: err.code,
      message: 'The analysis was given values it cannot compute with.',
      details: err.issues,
    };
  } else if (err.type === 'entity.parse.failed') {
    status = 400;
    body = { code: 'request.malformed_json', message: 'The request body is not valid JSON.' };
  } else if (err.type === 'entity.too.large') {
    status = 413;
    body = { code: 'request.too_large', message: 'The request body is too large.' };
  } else if (err.type === 'encoding.unsupported' || err.type === 'charset.unsupported') {
    status = 415;
    body = { code: 'request.unsupported_encoding', message: 'That body encoding is not supported.' };
  } else if ((err.status ?? err.statusCode) && (err.status ?? err.statusCode)! < 500 && err.expose) {
    status = (err.status ?? err.statusCode)!;
    body = { code: 'request.invalid', message: err.message };
  } else if ((err.status ?? err.statusCode) && (err.status ?? err.statusCode)! < 500) {
    // A 4xx whose message is not for the client: a missing static file, whose message names a path on disk.
    status = (err.status ?? err.statusCode)!;
    body =
      status === 404
        ? { code: 'route.not_found', message: 'There is nothing at this address.' }
        : { code: 'request.invalid', message: 'The request was refused.' };
  } else {
    body = {
      code: 'internal',
      message: 'Something went wrong on our side. It has been logged.',
      requestId: String(req.id),
    };
  }

  if (status >= 500) req.log?.error({ err }, 'request failed');
  else req.log?.debug({ code: body.code }, 'request refused');
  if (res.headersSent) return;
  res.status(status).json({ error: body });
};
