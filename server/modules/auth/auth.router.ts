import { Router, type Request } from 'express';
import { MoreThan } from 'typeorm';
import { loginSchema } from '../../../shared/schemas/auth';
import type { SessionUser, createPassport } from '../../auth/passport';
import { secondFactorRequired } from '../../auth/second-factor-policy';
import { recordSessionDevice, SESSION_COOKIE } from '../../auth/session';
import type { AppContext } from '../../context';
import { LoginAttempt } from '../../db/entities/login-attempt.entity';
import { User } from '../../db/entities/user.entity';
import { recordAudit } from '../../lib/audit';
import { clock } from '../../lib/clock';
import { AppError } from '../../lib/errors';
import { requireUser } from '../../middleware/auth';
import { parseBody } from '../../middleware/validate';
import { holdForSecondFactor } from '../second-factor/second-factor.service';
import { presentMe } from '../users/users.presenter';

export const LOGIN_WINDOW_MS = 15 * 60 * 1000;
export const LOGIN_MAX_FAILURES = 10;

type Authenticator = ReturnType<typeof createPassport>;

function authenticate(pp: Authenticator, req: Request): Promise<SessionUser | false> {
  return new Promise((resolve, reject) => {
    pp.authenticate('local', { session: false }, (err: unknown, user: SessionUser | false) =>
      err ? reject(err) : resolve(user),
    )(req, {} as never, () => {});
  });
}

export function authRouter(ctx: AppContext, pp: Authenticator) {
  const r = Router();
  const attempts = ctx.ds.getRepository(LoginAttempt);

  r.post('/login', async (req, res) => {
    const input = parseBody(loginSchema, req);
    req.body = input;
    const ip = req.ip ?? 'unknown';
    const since = new Date(clock.nowMs() - LOGIN_WINDOW_MS);
    const [byEmail, byIp] = await Promise.all([
      attempts.countBy({ email: input.email, attemptedAt: MoreThan(since) }),
      attempts.countBy({ ip, attemptedAt: MoreThan(since) }),
    ]);
    if (byEmail >= LOGIN_MAX_FAILURES || byIp >= LOGIN_MAX_FAILURES) {
      throw new AppError(
        429,
        'auth.too_many_attempts',
        'Too many failed sign-ins. Wait 15 minutes and try again.',
        undefined,
        {
          'Retry-After': String(LOGIN_WINDOW_MS / 1000),
        },
      );
    }

    const user = await authenticate(pp, req);
    if (!user) {
      await attempts.insert({ email: input.email, ip, attemptedAt: clock.now() });
      throw new AppError(
        401,
        'auth.invalid_credentials',
        'That e-mail and password do not match an active account.',
      );
    }

    if (await holdForSecondFactor(ctx, req, user)) {
      res.json({ secondFactor: 'required' });
      return;
    }

    // passport's logIn regenerates the session: a new id at every sign-in (no fixation).
    await new Promise<void>((resolve, reject) => req.logIn(user, (err) => (err ? reject(err) : resolve())));
    const now = clock.nowMs();
    req.session.createdAt = now;
    req.session.lastSeenAt = now;
    recordSessionDevice(req);
    await ctx.ds.transaction(async (m) => {
      await m.update(User, { id: user.id }, { lastSignInAt: clock.now() });
      await m.delete(LoginAttempt, { email: input.email });
      await recordAudit(
        m,
        { userId: user.id, organizationId: user.organizationId, requestId: String(req.id) },
        { action: 'user.signed_in', entityType: 'User', entityId: user.id, after: { ip } },
      );
    });
    res.json({ user: presentMe(user) });
  });

  r.post('/logout', async (req, res) => {
    if (req.session) {
      await new Promise<void>((resolve, reject) => req.logout((err) => (err ? reject(err) : resolve())));
      await new Promise<void>((resolve) => req.session.destroy(() => resolve()));
    }
    res.clearCookie(SESSION_COOKIE, { path: '/', httpOnly: true, sameSite: 'lax' });
    res.status(204).end();
  });

  r.get('/me', requireUser, (req, res) => {
    const secondFactor = {
      enrolled: Boolean(req.user!.totpConfirmedAt),
      required: secondFactorRequired(ctx.config, req.user!),
    };
    res.json({ user: presentMe(req.user!), app: { mode: ctx.config.mode }, secondFactor });
  });

  return r;
}
