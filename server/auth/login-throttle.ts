import crypto from 'node:crypto';
import type { Request, Response } from 'express';
import { RateLimiterMySQL, RateLimiterRes } from 'rate-limiter-flexible';
import type { AppDataSource } from '../db/data-source';
import { primaryPool } from '../db/read';
import { AppError } from '../lib/errors';

/**
 * Sign-in throttling (issue 13). Every attempt spends a point BEFORE its password is checked, with
 * rate-limiter-flexible's MariaDB store: one atomic INSERT … ON DUPLICATE KEY UPDATE per limiter, so guesses sent
 * in parallel, or to several server processes (WEB_CONCURRENCY > 1), each get their own count and no more than the
 * limit are ever judged. A successful sign-in gives its point back.
 *
 * What is keyed how (README, Security):
 * - account and address: 5 attempts per 15 minutes for one e-mail from one client address;
 * - address: 30 attempts per 15 minutes from one client address, whatever the accounts (password spraying);
 * - account: 10 attempts per hour for one e-mail from anywhere (the slower, account-wide limit);
 * - known device: a browser that signed in to the account before carries a signed device cookie
 *   (OWASP's "device cookie"); it is subject only to its own limit, 10 attempts per 15 minutes, and not to the
 *   three above, so an attacker spending the account's points does not lock its owner out.
 * Each limiter is consulted in that order and only when the ones before let the attempt through, so a refused
 * attempt spends nothing further (hammering one account does not use up the address's allowance for others).
 */
export const LOGIN_LIMITS = {
  accountAddress: { points: 5, duration: 15 * 60 },
  address: { points: 30, duration: 15 * 60 },
  account: { points: 10, duration: 60 * 60 },
  device: { points: 10, duration: 15 * 60 },
} as const;

export type LimitScope = keyof typeof LOGIN_LIMITS;

export const DEVICE_COOKIE = 'lp.device';
const DEVICE_COOKIE_MAX_AGE_MS = 180 * 24 * 60 * 60 * 1000;
const TABLE = 'login_limits';

type Spent = { scope: LimitScope; key: string };

export type Admission =
  | { ok: true; spent: Spent[]; device: string | null }
  | { ok: false; scope: LimitScope; retryAfterS: number; firstRefusal: boolean };

export type LoginThrottle = {
  /** Spends one attempt on each limiter that applies; refuses when one is spent. */
  admit(email: string, ip: string, req: Request): Promise<Admission>;
  /** A successful sign-in: its attempt does not count, and the account-and-address count starts over. */
  succeeded(email: string, admission: Admission & { ok: true }, res: Response): Promise<void>;
  forget(email: string): Promise<void>;
};

let active: LoginThrottle | null = null;

/**
 * Clears every sign-in counter of an account (its account-wide, per-address and per-device counts): after a
 * password reset, or when an operator unlocks it (`npm run auth:unlock -- EMAIL`).
 */
export async function forgetLoginFailures(email: string): Promise<void> {
  if (!active) throw new Error('The sign-in throttle is not set up (createApp has not run).');
  await active.forget(email);
}

/** Clears an account's counters with a data source of its own (the operator's command, no app needed). */
export async function forgetLoginFailuresIn(ds: AppDataSource, email: string): Promise<number> {
  const r = await ds.query(`DELETE FROM ${TABLE} WHERE \`key\` LIKE ? OR \`key\` LIKE ? OR \`key\` LIKE ?`, [
    `account:${likeEscape(normal(email))}`,
    `accountAddress:${likeEscape(normal(email))}|%`,
    `device:${likeEscape(normal(email))}|%`,
  ]);
  return Number((r as { affectedRows?: number }).affectedRows ?? 0);
}

function normal(email: string) {
  return email.trim().toLowerCase();
}

function likeEscape(s: string) {
  return s.replace(/[\\%_]/g, (c) => `\\${c}`);
}

function sign(secret: string, email: string, nonce: string) {
  return crypto
    .createHmac('sha256', secret)
    .update(`device|${normal(email)}|${nonce}`)
    .digest('base64url');
}

function cookieValue(req: Request, name: string): string | undefined {
  const header = req.headers.cookie;
  if (!header) return undefined;
  for (const part of header.split(';')) {
    const i = part.indexOf('=');
    if (i > 0 && part.slice(0, i).trim() === name) {
      try {
        return decodeURIComponent(part.slice(i + 1).trim());
      } catch {
        return undefined;
      }
    }
  }
  return undefined;
}

/** The device cookie's nonce when the request carries a valid one for this account, else null. */
function knownDevice(secret: string, req: Request, email: string): string | null {
  const v = cookieValue(req, DEVICE_COOKIE);
  const m = v?.match(/^([A-Za-z0-9_-]{1,400})\.([A-Za-z0-9_-]{16,32})\.([A-Za-z0-9_-]{43})$/);
  if (!m) return null;
  let who: string;
  try {
    who = Buffer.from(m[1], 'base64url').toString('utf8');
  } catch {
    return null;
  }
  if (who !== normal(email)) return null;
  const expected = Buffer.from(sign(secret, who, m[2]));
  const given = Buffer.from(m[3]);
  return expected.length === given.length && crypto.timingSafeEqual(expected, given) ? m[2] : null;
}

export function createLoginThrottle(
  ds: AppDataSource,
  opts: { secret: string; secureCookie: boolean },
): LoginThrottle {
  let limiters: Record<LimitScope, RateLimiterMySQL> | null = null;
  const limiter = (scope: LimitScope) => {
    if (!limiters) {
      // The primary's mysql2 pool (callback API; primaryPool works with or without replicas), which rate-limiter-flexible drives as storeType 'pool'; the
      // table comes from a migration.
      const pool = primaryPool(ds);
      const dbName = (ds.driver as unknown as { database: string }).database;
      const make = (s: LimitScope) =>
        new RateLimiterMySQL({
          storeClient: pool,
          storeType: 'pool',
          dbName,
          tableName: TABLE,
          tableCreated: true,
          // One of the four (they share the table) deletes rows whose window ended an hour ago, every 5 minutes.
          clearExpiredByTimeout: s === 'address',
          keyPrefix: s,
          ...LOGIN_LIMITS[s],
        });
      limiters = {
        accountAddress: make('accountAddress'),
        address: make('address'),
        account: make('account'),
        device: make('device'),
      };
    }
    return limiters[scope];
  };

  /** Spends a point; a store error (a deadlock between parallel upserts) is retried, then fails closed. */
  async function spend(scope: LimitScope, key: string): Promise<RateLimiterRes> {
    for (let attempt = 0; ; attempt++) {
      try {
        return await limiter(scope).consume(key);
      } catch (e) {
        if (e instanceof RateLimiterRes) throw e;
        if (attempt >= 4) {
          throw new AppError(
            503,
            'auth.unavailable',
            'Signing in is not possible just now. Try again shortly.',
          );
        }
        await new Promise((r) => setTimeout(r, 10 + Math.random() * 40));
      }
    }
  }

  const throttle: LoginThrottle = {
    async admit(email, ip, req) {
      const who = normal(email);
      const device = knownDevice(opts.secret, req, who);
      const plan: Spent[] = device
        ? [{ scope: 'device', key: `${who}|${device}` }]
        : [
            { scope: 'accountAddress', key: `${who}|${ip}` },
            { scope: 'address', key: ip },
            { scope: 'account', key: who },
          ];
      const spent: Spent[] = [];
      for (const step of plan) {
        try {
          await spend(step.scope, step.key);
          spent.push(step);
        } catch (e) {
          if (!(e instanceof RateLimiterRes)) throw e;
          return {
            ok: false,
            scope: step.scope,
            retryAfterS: Math.max(1, Math.ceil(e.msBeforeNext / 1000)),
            // The first refused attempt of a window is the lockout worth recording; the rest are its echo.
            firstRefusal: e.consumedPoints === LOGIN_LIMITS[step.scope].points + 1,
          };
        }
      }
      return { ok: true, spent, device };
    },

    async succeeded(email, admission, res) {
      const who = normal(email);
      await Promise.all(
        admission.spent.map((s) =>
          s.scope === 'accountAddress' ? limiter(s.scope).delete(s.key) : limiter(s.scope).reward(s.key, 1),
        ),
      );
      const nonce = admission.device ?? crypto.randomBytes(18).toString('base64url');
      res.cookie(
        DEVICE_COOKIE,
        `${Buffer.from(who).toString('base64url')}.${nonce}.${sign(opts.secret, who, nonce)}`,
        {
          httpOnly: true,
          sameSite: 'lax',
          secure: opts.secureCookie,
          path: '/api/auth',
          maxAge: DEVICE_COOKIE_MAX_AGE_MS,
        },
      );
    },

    async forget(email) {
      await forgetLoginFailuresIn(ds, email);
    },
  };
  active = throttle;
  return throttle;
}
