import type { RequestHandler } from 'express';
import type { AppConfig } from '../config/env';
import { AppError } from '../lib/errors';
import { secondFactorRequired } from '../auth/second-factor-policy';

/** What a person who must enrol may still do: see who they are, enrol, manage their sessions, sign out. */
const WHILE_ENROLLING = [
  'GET /auth/me',
  'POST /auth/login',
  'POST /auth/login/second-factor',
  'POST /auth/logout',
  'GET /auth/second-factor',
  'POST /auth/second-factor/enrollment',
  'POST /auth/second-factor/enrollment/confirm',
];

/**
 * A signed-in person who must have a second factor (by role or by their organisation's rule) and has none can do
 * nothing but enrol: the client sends them to the enrolment page, and every other route answers 403 here.
 */
export function requireSecondFactorEnrollment(config: AppConfig): RequestHandler {
  return (req, _res, next) => {
    const user = req.user;
    if (!user || user.totpConfirmedAt || !secondFactorRequired(config, user)) return next();
    const route = `${req.method} ${req.path.replace(/\/+$/, '')}`;
    if (WHILE_ENROLLING.includes(route) || req.path.startsWith('/auth/sessions')) return next();
    next(
      new AppError(
        403,
        'auth.second_factor_enrollment_required',
        'Set up a second factor (an authenticator app) before you carry on.',
      ),
    );
  };
}
