import type { RequestHandler } from 'express';
import { AppError } from '../lib/errors';

const SAFE = new Set(['GET', 'HEAD', 'OPTIONS']);

// Refuses state-changing requests that a browser marks as coming from another site. Scripts that send no
// Origin and no Sec-Fetch-Site, or their own origin, pass.
export function sameOrigin(publicUrl: string | undefined): RequestHandler {
  const configured = publicUrl ? new URL(publicUrl).origin : null;
  return (req, _res, next) => {
    if (SAFE.has(req.method)) return next();
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
