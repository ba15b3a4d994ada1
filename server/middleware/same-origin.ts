import type { RequestHandler } from 'express';
import { AppError } from '../lib/errors';

const SAFE = new Set(['GET', 'HEAD', 'OPTIONS']);

// Refuses state-changing requests that a browser marks as coming from another site. Scripts that send no
// Origin and no Sec-Fetch-Site, or their own origin, pass. A bearer-token request without a cookie carries no
// ambient credential (a page on another site cannot add an Authorization header without a CORS preflight, which
// is never granted), so the check is about cookies only; a request with both still goes through it.
export function sameOrigin(publicUrl: string | undefined): RequestHandler {
  const configured = publicUrl ? new URL(publicUrl).origin : null;
  return (req, _res, next) => {
    if (SAFE.has(req.method)) return next();
    if (/^bearer\s/i.test(req.get('authorization') ?? '') && !req.get('cookie')) return next();
    if (req.get('sec-fetch-site') === 'cross-site') {
      return next(new AppError(403, 'request.cross_site', 'Requests from other sites are refused.'));
    }
    const origin = req.get('origin');
    if (origin) {
      const own = `${req.protocol}://${req.get('host')}`;
      if (origin !== own && origin !== configured) {
        return next(new AppError(403, 'request.cross_origin', 'Requests from other origins are refused.'));
      }
    }
    next();
  };
}
