import crypto from 'node:crypto';
import { forgetLoginFailuresIn } from '../../auth/login-throttle';
import type { EntityManager } from 'typeorm';
import { IsNull, MoreThan } from 'typeorm';
import { PASSWORD_RESET_MINUTES } from '../../../shared/schemas/auth';
import { assertPasswordAllowed } from '../../auth/password-policy';
import { hashPassword, verifyPassword } from '../../auth/passwords';
import type { AppContext } from '../../context';
import { PasswordResetRequest } from '../../db/entities/password-reset-request.entity';
import { PasswordReset } from '../../db/entities/password-reset.entity';
import { User } from '../../db/entities/user.entity';
import { recordAudit, type Actor } from '../../lib/audit';
import { clock } from '../../lib/clock';
import { AppError } from '../../lib/errors';
import { enqueueEmail } from '../../lib/outbox';
import { hashToken } from '../users/users.service';

export const PASSWORD_RESET_TTL_MS = PASSWORD_RESET_MINUTES * 60 * 1000;
/** "Forgot password" requests: per e-mail address asked about, and per client address, in one window. */
export const RESET_REQUEST_WINDOW_MS = 60 * 60 * 1000;
export const RESET_REQUESTS_PER_EMAIL = 3;
export const RESET_REQUESTS_PER_IP = 20;

const linkGone = () =>
  new AppError(
    404,
    'password_reset.invalid',
    'This link is not valid any more: it was used, or it is more than 30 minutes old. Ask for a new one.',
  );

/** Ends the user's signed-in sessions (the rows in the sessions table), all of them or all but one. */
export async function endSessions(m: EntityManager, userId: string, keepSessionId?: string) {
  // express-mysql-session keeps the session as JSON; passport puts the user's id at passport.user.
  const result = await m.query(
    `DELETE FROM sessions WHERE JSON_VALUE(data, '$.passport.user') = ?${keepSessionId ? ' AND session_id <> ?' : ''}`,
    keepSessionId ? [userId, keepSessionId] : [userId],
  );
  return Number((result as { affectedRows?: number }).affectedRows ?? 0);
}

export function createPasswordsService(ctx: AppContext) {
  const { ds } = ctx;

  return {
    /**
     * Counts a "forgot password" request against its limits, known address or not. The row goes in before the
     * count, so requests sent at once each see the ones before them and no more than the limit get through; a
     * refused request takes its row out again (it changed nothing).
     */
    async admitResetRequest(email: string, ip: string) {
      const now = clock.now();
      const since = new Date(now.getTime() - RESET_REQUEST_WINDOW_MS);
      const repo = ds.getRepository(PasswordResetRequest);
      const { identifiers } = await repo.insert({ email, ip, requestedAt: now });
      const [byEmail, byIp] = await Promise.all([
        repo.countBy({ email, requestedAt: MoreThan(since) }),
        repo.countBy({ ip, requestedAt: MoreThan(since) }),
      ]);
      if (byEmail > RESET_REQUESTS_PER_EMAIL || byIp > RESET_REQUESTS_PER_IP) {
        await repo.delete({ id: identifiers[0].id });
        throw new AppError(
          429,
          'auth.too_many_resets',
          'Too many requests to reset a password. Wait an hour and try again, or ask your administrator.',
          undefined,
          { 'Retry-After': String(RESET_REQUEST_WINDOW_MS / 1000) },
        );
      }
      // Old rows are of no use to any window: a few go with each request.
      await ds.query('DELETE FROM password_reset_requests WHERE requested_at < ? LIMIT 50', [since]);
    },

    /**
     * Sends a reset link if the address belongs to an active account. Runs after the answer has gone (see the
     * router), so whether the address exists changes neither the answer nor its timing.
     */
    async sendResetLink(email: string, requestId: string) {
      const user = await ds.getRepository(User).findOne({ where: { email, status: 'active' } });
      if (!user) return false;
      const token = crypto.randomBytes(32).toString('base64url');
      const expiresAt = new Date(clock.nowMs() + PASSWORD_RESET_TTL_MS);
      await ds.transaction(async (m) => {
        await m.insert(PasswordReset, {
          userId: user.id,
          tokenHash: hashToken(token),
          expiresAt,
          usedAt: null,
        });
        await enqueueEmail(m, {
          to: [user.email],
          template: 'password-reset',
          view: {
            name: user.name,
            link: ctx.publicUrl(`/reset-password/${token}`),
            minutes: PASSWORD_RESET_MINUTES,
          },
        });
        await recordAudit(
          m,
          { userId: null, organizationId: user.organizationId, requestId },
          { action: 'user.password_reset_requested', entityType: 'User', entityId: user.id },
        );
      });
      return true;
    },

    /** Sets a new password with a reset link's token; the link is spent and every session of the user ends. */
    async resetPassword(token: string, password: string, requestId: string) {
      const reset = await ds.getRepository(PasswordReset).findOne({
        where: { tokenHash: hashToken(token), usedAt: IsNull() },
        relations: { user: true },
      });
      if (!reset || reset.expiresAt.getTime() <= clock.nowMs() || reset.user.status !== 'active')
        throw linkGone();
      const user = reset.user;
      assertPasswordAllowed(password, 'password', user.email);
      const passwordHash = await hashPassword(password);
      const ended = await ds.transaction(async (m) => {
        const spent = await m.update(
          PasswordReset,
          { id: reset.id, usedAt: IsNull() },
          { usedAt: clock.now() },
        );
        if (!spent.affected) throw linkGone();
        // Any other link still out for this account goes with it.
        await m.update(PasswordReset, { userId: user.id, usedAt: IsNull() }, { usedAt: clock.now() });
        await m.update(User, { id: user.id }, { passwordHash });
        const sessions = await endSessions(m, user.id);
        await recordAudit(
          m,
          { userId: user.id, organizationId: user.organizationId, requestId },
          {
            action: 'user.password_reset',
            entityType: 'User',
            entityId: user.id,
            after: { sessionsEnded: sessions },
          },
        );
        await enqueueEmail(m, {
          to: [user.email],
          template: 'password-changed',
          view: { name: user.name, how: 'with a reset link' },
        });
        return sessions;
      });
      // A new password is a fresh start: the account's sign-in counts go (the owner is never locked out by them).
      await forgetLoginFailuresIn(ctx.ds, user.email);
      return { email: user.email, sessionsEnded: ended };
    },

    /** Changes a signed-in user's password; their other sessions end, this one stays. */
    async changePassword(
      userId: string,
      input: { currentPassword: string; newPassword: string },
      actor: Actor,
      keepSessionId: string,
    ) {
      const user = await ds.getRepository(User).findOne({
        where: { id: userId },
        select: { id: true, email: true, name: true, passwordHash: true, organizationId: true },
      });
      if (!user) throw new AppError(401, 'auth.required', 'Sign in to continue.');
      // Refused without writing anything (an audit row per wrong guess would let a stolen session flood the log).
      if (!(await verifyPassword(user.passwordHash, input.currentPassword))) {
        throw new AppError(400, 'auth.wrong_password', 'Your current password is not right.', [
          { path: 'currentPassword', message: 'This is not your current password.' },
        ]);
      }
      assertPasswordAllowed(input.newPassword, 'newPassword', user.email);
      const passwordHash = await hashPassword(input.newPassword);
      return ds.transaction(async (m) => {
        await m.update(User, { id: user.id }, { passwordHash });
        await m.update(PasswordReset, { userId: user.id, usedAt: IsNull() }, { usedAt: clock.now() });
        const sessions = await endSessions(m, user.id, keepSessionId);
        await recordAudit(m, actor, {
          action: 'user.password_changed',
          entityType: 'User',
          entityId: user.id,
          after: { sessionsEnded: sessions },
        });
        await enqueueEmail(m, {
          to: [user.email],
          template: 'password-changed',
          view: { name: user.name, how: 'from your account page' },
        });
        return { sessionsEnded: sessions };
      });
    },
  };
}
