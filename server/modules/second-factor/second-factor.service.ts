import type { Request } from 'express';
import QRCode from 'qrcode';
import type { EntityManager } from 'typeorm';
import type { SecondFactorStatusDto } from '../../../shared/schemas/security';
import type { SessionUser } from '../../auth/passport';
import { verifyPassword } from '../../auth/passwords';
import { recordSessionDevice } from '../../auth/session';
import { hashRecoveryCode, newRecoveryCode, newTotpSecret, totpUri, verifyTotp } from '../../auth/totp';
import { secondFactorRequired } from '../../auth/second-factor-policy';
import type { AppContext } from '../../context';
import { RecoveryCode } from '../../db/entities/recovery-code.entity';
import { SignInChallenge } from '../../db/entities/sign-in-challenge.entity';
import { User } from '../../db/entities/user.entity';
import { recordAudit, type Actor } from '../../lib/audit';
import { clock } from '../../lib/clock';
import { AppError, conflict } from '../../lib/errors';

/** Wrong codes allowed per pending sign-in; the next try must start again with the password. */
export const SECOND_FACTOR_MAX_ATTEMPTS = 5;
/** How long a sign-in waits for its code. */
export const SECOND_FACTOR_WINDOW_MS = 5 * 60 * 1000;
export const RECOVERY_CODE_COUNT = 10;

const invalidCode = (status: 400 | 401) =>
  new AppError(
    status,
    'auth.second_factor_invalid_code',
    'That code is not right. Check your authenticator app.',
  );
const notPending = () =>
  new AppError(
    401,
    'auth.second_factor_not_pending',
    'No sign-in is waiting for a code. Start again with your e-mail and password.',
  );

function logIn(req: Request, user: SessionUser) {
  return new Promise<void>((resolve, reject) => req.logIn(user, (err) => (err ? reject(err) : resolve())));
}

/**
 * Called by the login route once the password is right. A user with a confirmed factor is not signed in yet: the
 * session only names a challenge, which a code completes (POST /api/auth/login/second-factor). Returns whether it
 * held the sign-in.
 */
export async function holdForSecondFactor(
  ctx: AppContext,
  req: Request,
  user: SessionUser,
): Promise<boolean> {
  if (!user.totpConfirmedAt) return false;
  // A fresh session id: nothing from before the password carries over.
  await new Promise<void>((resolve, reject) => req.session.regenerate((e) => (e ? reject(e) : resolve())));
  const challenge = await ctx.ds.getRepository(SignInChallenge).save({
    userId: user.id,
    attempts: 0,
    expiresAt: new Date(clock.nowMs() + SECOND_FACTOR_WINDOW_MS),
  });
  req.session.secondFactorChallengeId = challenge.id;
  return true;
}

export function createSecondFactorService(ctx: AppContext) {
  const { ds } = ctx;

  async function clearFactor(m: EntityManager, userId: string) {
    await m.update(User, { id: userId }, { totpSecret: null, totpConfirmedAt: null, totpLastStep: null });
    await m.delete(RecoveryCode, { userId });
    await m.delete(SignInChallenge, { userId });
  }

  return {
    async status(user: SessionUser): Promise<SecondFactorStatusDto> {
      const unused = user.totpConfirmedAt
        ? await ds
            .getRepository(RecoveryCode)
            .createQueryBuilder('r')
            .where('r.user_id = :id AND r.used_at IS NULL', { id: user.id })
            .getCount()
        : 0;
      return {
        enrolled: Boolean(user.totpConfirmedAt),
        required: secondFactorRequired(ctx.config, user),
        recoveryCodesLeft: unused,
      };
    },

    async completeSignIn(req: Request, code: string) {
      const challengeId = req.session?.secondFactorChallengeId;
      if (!challengeId) throw notPending();
      // The attempt counts before the code is judged, atomically: parallel guesses cannot pass the limit.
      const counted = await ds
        .createQueryBuilder()
        .update(SignInChallenge)
        .set({ attempts: () => 'attempts + 1' })
        .where('id = :id AND attempts < :max AND expires_at > :now', {
          id: challengeId,
          max: SECOND_FACTOR_MAX_ATTEMPTS,
          now: clock.now(),
        })
        .execute();
      if (!counted.affected) {
        await ds.getRepository(SignInChallenge).delete({ id: challengeId });
        delete req.session.secondFactorChallengeId;
        throw notPending();
      }
      const challenge = await ds.getRepository(SignInChallenge).findOneBy({ id: challengeId });
      const user = challenge
        ? await ds
            .getRepository(User)
            .findOne({ where: { id: challenge.userId }, relations: { organization: true } })
        : null;
      if (!challenge || !user || user.status !== 'active' || !user.totpSecret) throw notPending();

      const now = clock.now();
      let method: 'totp' | 'recovery_code' | null = null;
      const step = /^\d{6}$/.test(code)
        ? await verifyTotp(user.totpSecret, code, now.getTime(), user.totpLastStep)
        : null;
      if (step !== null) {
        // A step is spent once, whichever request gets there first (RFC 6238 section 5.2).
        const spent = await ds
          .createQueryBuilder()
          .update(User)
          .set({ totpLastStep: step })
          .where('id = :id AND (totp_last_step IS NULL OR totp_last_step < :step)', { id: user.id, step })
          .execute();
        if (spent.affected) method = 'totp';
      } else if (!/^\d+$/.test(code)) {
        const used = await ds
          .createQueryBuilder()
          .update(RecoveryCode)
          .set({ usedAt: now })
          .where('user_id = :id AND code_hash = :hash AND used_at IS NULL', {
            id: user.id,
            hash: hashRecoveryCode(code),
          })
          .execute();
        if (used.affected) method = 'recovery_code';
      }
      if (!method) {
        // A wrong second factor after a right password is a sign-in failure worth an administrator's eye.
        await ds.transaction((m) =>
          recordAudit(
            m,
            { userId: null, organizationId: user.organizationId, requestId: String(req.id) },
            {
              action: 'user.sign_in_failed',
              entityType: 'User',
              entityId: user.id,
              after: { ip: req.ip ?? null, reason: 'second_factor', attempt: challenge.attempts },
            },
          ),
        );
        throw invalidCode(401);
      }

      // One completion per challenge: a second request with another good code finds it gone.
      const taken = await ds.getRepository(SignInChallenge).delete({ id: challengeId });
      if (!taken.affected) throw notPending();
      await logIn(req, user as SessionUser);
      req.session.createdAt = now.getTime();
      req.session.lastSeenAt = now.getTime();
      recordSessionDevice(req);
      const actor: Actor = {
        userId: user.id,
        organizationId: user.organizationId,
        requestId: String(req.id),
      };
      await ds.transaction(async (m) => {
        await m.update(User, { id: user.id }, { lastSignInAt: now });
        await recordAudit(m, actor, {
          action: 'user.signed_in',
          entityType: 'User',
          entityId: user.id,
          after: { ip: req.ip ?? null, secondFactor: method },
        });
        if (method === 'recovery_code')
          await recordAudit(m, actor, {
            action: 'user.recovery_code_used',
            entityType: 'User',
            entityId: user.id,
            after: { ip: req.ip ?? null },
          });
      });
      return user as SessionUser;
    },

    async startEnrollment(req: Request, user: SessionUser) {
      if (user.totpConfirmedAt)
        throw conflict(
          'auth.second_factor_exists',
          'You already have a second factor. Remove it first to set up another.',
        );
      const secret = newTotpSecret();
      req.session.enrollmentSecret = secret;
      const otpauthUrl = totpUri(secret, user.email);
      const qrSvg = await QRCode.toString(otpauthUrl, { type: 'svg', errorCorrectionLevel: 'M', margin: 2 });
      return { secret, otpauthUrl, qrSvg };
    },

    async confirmEnrollment(req: Request, user: SessionUser, code: string) {
      const secret = req.session.enrollmentSecret;
      if (!secret)
        throw conflict('auth.enrollment_not_started', 'Start setting up your authenticator app first.');
      const step = await verifyTotp(secret, code, clock.nowMs(), null);
      if (step === null) throw invalidCode(400);
      const codes = Array.from({ length: RECOVERY_CODE_COUNT }, newRecoveryCode);
      await ds.transaction(async (m) => {
        const set = await m
          .createQueryBuilder()
          .update(User)
          .set({ totpSecret: secret, totpConfirmedAt: clock.now(), totpLastStep: step })
          .where('id = :id AND totp_confirmed_at IS NULL', { id: user.id })
          .execute();
        if (!set.affected)
          throw conflict(
            'auth.second_factor_exists',
            'You already have a second factor. Remove it first to set up another.',
          );
        await m.delete(RecoveryCode, { userId: user.id });
        await m.insert(
          RecoveryCode,
          codes.map((c) => ({ userId: user.id, codeHash: hashRecoveryCode(c), usedAt: null })),
        );
        await recordAudit(m, actorOf(req, user), {
          action: 'user.second_factor_added',
          entityType: 'User',
          entityId: user.id,
          after: { method: 'totp', ip: req.ip ?? null },
        });
      });
      delete req.session.enrollmentSecret;
      return codes;
    },

    async remove(req: Request, user: SessionUser, password: string) {
      if (secondFactorRequired(ctx.config, user))
        throw new AppError(
          403,
          'auth.second_factor_required',
          'A second factor is required for your account; it cannot be removed.',
        );
      if (!user.totpConfirmedAt)
        throw conflict('auth.no_second_factor', 'You have no second factor to remove.');
      const stored = await ds
        .getRepository(User)
        .findOne({ where: { id: user.id }, select: { id: true, passwordHash: true } });
      if (!(await verifyPassword(stored?.passwordHash ?? null, password)))
        throw new AppError(403, 'auth.invalid_password', 'That password is not right.');
      await ds.transaction(async (m) => {
        await clearFactor(m, user.id);
        await recordAudit(m, actorOf(req, user), {
          action: 'user.second_factor_removed',
          entityType: 'User',
          entityId: user.id,
          after: { ip: req.ip ?? null },
        });
      });
    },

    /** An administrator's reset of a colleague's factor (lost phone): they enrol again at their next sign-in. */
    async reset(req: Request, admin: SessionUser, target: User) {
      if (target.id === admin.id)
        throw conflict(
          'user.second_factor_self_reset',
          'Remove your own second factor on your security page; another administrator can reset it.',
        );
      await ds.transaction(async (m) => {
        await clearFactor(m, target.id);
        await recordAudit(m, actorOf(req, admin), {
          action: 'user.second_factor_reset',
          entityType: 'User',
          entityId: target.id,
          organizationId: target.organizationId,
          before: { enrolled: Boolean(target.totpConfirmedAt) },
        });
      });
    },
  };
}

function actorOf(req: Request, user: SessionUser): Actor {
  return { userId: user.id, organizationId: user.organizationId, requestId: String(req.id) };
}
