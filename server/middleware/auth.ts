import { subject } from '@casl/ability';
import type { RequestHandler } from 'express';
import { defineAbilityFor, type Action, type AppAbility, type SubjectName } from '../../shared/abilities';
import type { SessionUser } from '../auth/passport';
import { ABSOLUTE_TIMEOUT_MS, IDLE_TIMEOUT_MS, SESSION_TOUCH_INTERVAL_MS } from '../auth/session';
import { clock } from '../lib/clock';
import { AppError, forbidden, notFound, unauthenticated } from '../lib/errors';

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      ability: AppAbility;
    }
  }
}

export function toAbilityUser(user: SessionUser) {
  return {
    id: user.id,
    roles: user.roles,
    organization: { id: user.organization.id, kind: user.organization.kind },
  };
}

/** Ends sessions idle for 30 minutes or older than 8 hours (by the server's clock), then builds the ability. */
export function sessionPolicy(opts: { demoMode: boolean }): RequestHandler {
  return (req, _res, next) => {
    const s = req.session;
    if (req.user && s) {
      const now = clock.nowMs();
      const expired =
        (s.createdAt && now - s.createdAt > ABSOLUTE_TIMEOUT_MS) ||
        (s.lastSeenAt && now - s.lastSeenAt > IDLE_TIMEOUT_MS);
      if (expired) {
        return s.destroy(() => {
          req.user = undefined;
          next(new AppError(401, 'auth.session_expired', 'Your session has ended. Please sign in again.'));
        });
      }
      if (!s.lastSeenAt || now - s.lastSeenAt >= SESSION_TOUCH_INTERVAL_MS) {
        s.lastSeenAt = now;
        s.ip = req.ip ?? '';
      }
    }
    req.ability = defineAbilityFor(req.user ? toAbilityUser(req.user) : null, {
      ...opts,
      viaApiToken: Boolean(req.apiToken),
    });
    next();
  };
}

export const requireUser: RequestHandler = (req, _res, next) => {
  if (!req.user) return next(unauthenticated());
  next();
};

/**
 * Authorises an action on a loaded record. A record the user may not even read answers 404, exactly like a
 * missing one; a record they may read but not change answers 403.
 */
export function authorize(
  req: { ability: AppAbility },
  action: Action,
  type: Exclude<SubjectName, 'all'>,
  record: object | null | undefined,
  what = 'record',
): asserts record is object {
  if (!record) throw notFound(what);
  const s = subject(type, { ...(record as Record<string, unknown>) });
  if (!req.ability.can('read', s)) throw notFound(what);
  if (action !== 'read' && !req.ability.can(action, s)) throw forbidden();
}

/** For actions on a kind of thing rather than one record (creating, listing). */
export function authorizeType(
  req: { ability: AppAbility },
  action: Action,
  type: Exclude<SubjectName, 'all'>,
) {
  if (!req.ability.can(action, type)) throw forbidden();
}

/**
 * For creating a record whose owners are known before it exists (the candidate's organisation ids): a
 * refusal is 403, since there is no record to hide.
 */
export function authorizeNew(
  req: { ability: AppAbility },
  action: Action,
  type: Exclude<SubjectName, 'all'>,
  candidate: Record<string, unknown>,
) {
  if (!req.ability.can(action, subject(type, { ...candidate }))) throw forbidden();
}
