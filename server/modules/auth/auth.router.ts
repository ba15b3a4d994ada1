import { Router, type Request } from 'express';
import { loginSchema } from '../../../shared/schemas/auth';
import { createLoginThrottle, type LimitScope } from '../../auth/login-throttle';
import type { SessionUser, createPassport } from '../../auth/passport';
import { secondFactorRequired } from '../../auth/second-factor-policy';
import type { MeSecondFactor } from '../../../shared/schemas/security';
import { recordSessionDevice, SESSION_COOKIE } from '../../auth/session';
import type { AppContext } from '../../context';
import { User } from '../../db/entities/user.entity';
import { recordAudit } from '../../lib/audit';
import { clock } from '../../lib/clock';
import { AppError } from '../../lib/errors';
import { requireUser } from '../../middleware/auth';
import { parseBody } from '../../middleware/validate';
import { holdForSecondFactor } from '../second-factor/second-factor.service';
import { presentMe } from '../users/users.presenter';

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
  const throttle = createLoginThrottle(ctx.ds, {
    secret: ctx.config.sessionSecret,
    secureCookie: ctx.config.publicUrl?.startsWith('https://') ?? false,
  });

  r.post('/login', async (req, res) => {
    const input = parseBody(loginSchema, req);
    req.body = input;
    const ip = req.ip ?? 'unknown';
    const requestId = String(req.id);
    // The attempt is counted before the password is looked at (server/auth/login-throttle.ts).
    const admission = await throttle.admit(input.email, ip, req);
    if (!admission.ok) {
      if (admission.firstRefusal) await auditLockout(ctx, input.email, ip, admission.scope, requestId);
      throw new AppError(
        429,
        'auth.too_many_attempts',
        'Too many sign-in attempts. Wait a while and try again, or sign in from a device you have used before.',
        undefined,
        { 'Retry-After': String(admission.retryAfterS) },
      );
    }

    const user = await authenticate(pp, req);
    if (!user) {
      await auditFailure(ctx, input.email, ip, requestId);
      throw new AppError(
        401,
        'auth.invalid_credentials',
        'That e-mail and password do not match an active account.',
      );
    }
    await throttle.succeeded(input.email, admission, res);

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
    const secondFactor: MeSecondFactor = {
      enrolled: Boolean(req.user!.totpConfirmedAt),
      required: secondFactorRequired(ctx.config, req.user!),
    };
    res.json({ user: presentMe(req.user!), app: { mode: ctx.config.mode }, secondFactor });
  });

  return r;
}

async function accountOf(ctx: AppContext, email: string) {
  return ctx.ds
    .getRepository(User)
    .findOne({ where: { email: email.trim().toLowerCase() }, select: { id: true, organizationId: true } });
}

/**
 * A wrong password for an existing account goes on its organisation's record. At most as many rows as the limits
 * let attempts through (an unknown e-mail writes nothing: it belongs to no one, and a sprayer could fill the
 * table with them).
 */
async function auditFailure(ctx: AppContext, email: string, ip: string, requestId: string) {
  const account = await accountOf(ctx, email);
  if (!account) return;
  await ctx.ds.transaction((m) =>
    recordAudit(
      m,
      { userId: null, organizationId: account.organizationId, requestId },
      { action: 'user.sign_in_failed', entityType: 'User', entityId: account.id, after: { ip } },
    ),
  );
}

/** One row per limit and window: the first refusal, not each of the attempts refused after it. */
async function auditLockout(
  ctx: AppContext,
  email: string,
  ip: string,
  scope: LimitScope,
  requestId: string,
) {
  const account = scope === 'address' ? null : await accountOf(ctx, email);
  if (scope !== 'address' && !account) return;
  await ctx.ds.transaction((m) =>
    recordAudit(
      m,
      { userId: null, organizationId: account?.organizationId ?? null, requestId },
      account
        ? { action: 'user.locked_out', entityType: 'User', entityId: account.id, after: { ip, scope } }
        : { action: 'address.locked_out', entityType: 'Address', entityId: ip, after: { scope } },
    ),
  );
}
