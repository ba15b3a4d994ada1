import type { RequestHandler } from 'express';
import type { AppConfig } from '../config/env';
import { withReadRouting } from '../db/read';
import { clock } from '../lib/clock';

/**
 * Read-your-writes with read replicas, by time: a request that may write (any method but GET, HEAD, OPTIONS)
 * reads only from the primary, and leaves its client a cookie with the time it wrote; for
 * READ_YOUR_WRITES_SECONDS after that, the client's reads go to the primary too. Past that window a replica
 * answers (on loopback or a LAN it is milliseconds behind). The cookie lives in the browser, so it holds across
 * the processes of a cluster and needs no table; a client that forges or drops it only moves its own reads
 * between the primary and a replica, which both hold the same committed data, one of them a moment later.
 *
 * Chosen over waiting on the replica for the session's last GTID (MASTER_GTID_WAIT): that costs a statement
 * before every read and a lookup after every transaction, while this costs nothing on the hot path.
 *
 * The routing is held in AsyncLocalStorage. Mount it first and again before the routers: a middleware that
 * continues from a driver's callback (the session store) can leave the request's async context.
 */
export const WROTE_COOKIE = 'lp_wrote';

const READ_ONLY_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);
const decided = Symbol('readRouting');

export function readYourWrites(config: AppConfig): RequestHandler {
  const windowMs = config.readYourWritesSeconds * 1000;
  const secure = config.publicUrl?.startsWith('https://') ?? false;
  return (req, res, next) => {
    const r = req as typeof req & { [decided]?: boolean };
    if (r[decided] === undefined) {
      const now = clock.nowMs();
      const writes = !READ_ONLY_METHODS.has(req.method);
      const wroteAt = Number(/(?:^|;\s*)lp_wrote=(\d{1,15})/.exec(req.headers.cookie ?? '')?.[1] ?? 0);
      r[decided] = writes || (wroteAt > 0 && now - wroteAt < windowMs && wroteAt <= now + 60_000);
      if (writes && windowMs > 0)
        res.cookie(WROTE_COOKIE, String(now), {
          httpOnly: true,
          sameSite: 'lax',
          secure,
          path: '/',
          maxAge: windowMs,
        });
    }
    withReadRouting(r[decided], next);
  };
}
