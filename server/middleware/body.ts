import express, { type RequestHandler } from 'express';
import { AppError, unauthenticated } from '../lib/errors';

// Request bodies are read only once the request may send one: after the session (a signed-out request to any route
// but signing in and accepting an invitation is answered 401 on its headers), and only up to its route's own limit,
// judged first from Content-Length. Before this, 19.5 MB of JSON to an import was read and parsed for 430 ms before
// its 401.

/** Each route's body limit in bytes, first match wins; everything else takes DEFAULT_BODY_LIMIT. */
export const BODY_LIMITS: { path: RegExp; bytes: number }[] = [
  // Spreadsheet imports carry a whole file (10,000 rows is about 2 MB).
  { path: /^\/(?:products|installations)\/import\/?$/, bytes: 20 * 1024 * 1024 },
  { path: /^\/claims\/batches(?:\/|$)/, bytes: 6 * 1024 * 1024 },
  // What is sent without a session: sign-in, invitation acceptance (and the password forms).
  { path: /^\/(?:auth|invitations)(?:\/|$)/, bytes: 16 * 1024 },
];
export const DEFAULT_BODY_LIMIT = 512 * 1024;

/** Routes that take a body without a session. */
const PUBLIC_BODY = /^\/(?:auth|invitations)(?:\/|$)/;
// Multipart uploads are parsed (and limited) by the upload middleware after the route has authorised them.
const MULTIPART = /\/(?:attachments|conversation\/uploads)\/?$/;

export function bodyLimitOf(path: string) {
  return BODY_LIMITS.find((l) => l.path.test(path))?.bytes ?? DEFAULT_BODY_LIMIT;
}

/** Refuses without reading: the connection is closed after the answer so the rest of the upload is never taken. */
function refuse(res: Parameters<RequestHandler>[1], next: Parameters<RequestHandler>[2], err: AppError) {
  res.set('Connection', 'close');
  next(err);
}

/** After the session middleware, before any body parser. */
export const bodyGate: RequestHandler = (req, res, next) => {
  const length = req.get('content-length');
  const hasBody = (length !== undefined && Number(length) > 0) || req.get('transfer-encoding') !== undefined;
  if (!hasBody) return next();
  if (!req.user && !PUBLIC_BODY.test(req.path)) return refuse(res, next, unauthenticated());
  if (MULTIPART.test(req.path) && req.is('multipart/form-data')) return next();
  if (length !== undefined && Number(length) > bodyLimitOf(req.path)) {
    return refuse(res, next, new AppError(413, 'request.too_large', 'The request body is too large.'));
  }
  next();
};

/** JSON parsing with the route's own limit (also enforced while reading a body sent without Content-Length). */
export function jsonBodies(): RequestHandler {
  const parsers = new Map<number, RequestHandler>();
  const parserFor = (bytes: number) => {
    let p = parsers.get(bytes);
    if (!p) parsers.set(bytes, (p = express.json({ limit: bytes, strict: true })));
    return p;
  };
  for (const l of BODY_LIMITS) parserFor(l.bytes);
  parserFor(DEFAULT_BODY_LIMIT);
  return (req, res, next) => parserFor(bodyLimitOf(req.path))(req, res, next);
}
