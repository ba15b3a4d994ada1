import type { RequestHandler } from 'express';
import { RateLimiterMySQL, RateLimiterRes } from 'rate-limiter-flexible';
import type { SessionUser } from '../auth/passport';
import type { AppContext } from '../context';
import { ApiToken } from '../db/entities/api-token.entity';
import { User } from '../db/entities/user.entity';
import { primaryPool } from '../db/read';
import { recordAudit } from '../lib/audit';
import { clock } from '../lib/clock';
import { AppError } from '../lib/errors';
import { apiTokenMatches, apiTokenState, parseApiToken } from '../modules/api-tokens/api-tokens.service';

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      /** Set when the request was authenticated by an API token rather than a session. */
      apiToken?: { id: string; name: string };
    }
  }
}

/** The table rate-limiter-flexible keeps its counters in (made by a migration, so tableCreated is true). */
export const API_TOKEN_RATE_TABLE = 'api_token_rate_limits';

const invalid = () =>
  new AppError(401, 'auth.invalid_token', 'The API token is not valid: unknown, expired or revoked.');

/** Whether the request presents a bearer token (the session and the cross-origin check then step aside). */
export const hasBearer = (req: { get(name: string): string | undefined }) =>
  /^bearer\s/i.test(req.get('authorization') ?? '');

/**
 * Authenticates `Authorization: Bearer lpt_…` requests as a token principal: the token's creator (who is named in
 * "created by" fields) with the token's roles and no session. Each accepted use is counted against the token's
 * rate limit (in MariaDB, so it holds across processes) and written to the audit log before the route runs.
 */
export function apiTokenAuth(ctx: AppContext) {
  let limiter: RateLimiterMySQL | null = null;
  const limiterOf = () =>
    (limiter ??= new RateLimiterMySQL({
      storeClient: primaryPool(ctx.ds),
      storeType: 'pool',
      dbName: (ctx.ds.driver as unknown as { database: string }).database,
      tableName: API_TOKEN_RATE_TABLE,
      tableCreated: true,
      keyPrefix: 'api_token',
      points: ctx.config.apiTokenRatePerMinute,
      duration: 60,
    }));

  const authenticate: RequestHandler = async (req, _res, next) => {
    try {
      if (!req.get('authorization')) return next();
      const m = /^Bearer\s+(\S+)\s*$/i.exec(req.get('authorization')!);
      if (!m) return next(); // another scheme: not ours, the route asks for a session as usual
      const parsed = parseApiToken(m[1]);
      if (!parsed) throw invalid();
      const token = await ctx.ds.getRepository(ApiToken).findOne({
        where: { id: parsed.id },
        relations: { organization: true },
      });
      if (!token || !apiTokenMatches(m[1], token.secretHash) || apiTokenState(token) !== 'active')
        throw invalid();
      const creator = await ctx.ds.getRepository(User).findOneBy({ id: token.createdById });
      // The token acts on its creator's behalf: when that account is disabled the token stops too.
      if (!creator || creator.status !== 'active') throw invalid();

      try {
        await limiterOf().consume(token.id);
      } catch (err) {
        if (!(err instanceof RateLimiterRes)) throw err;
        const seconds = Math.max(1, Math.ceil(err.msBeforeNext / 1000));
        throw new AppError(
          429,
          'api_token.rate_limited',
          `Too many requests with this token; try again in ${seconds} s.`,
          undefined,
          { 'Retry-After': String(seconds) },
        );
      }

      const now = clock.now();
      await ctx.ds.transaction(async (tm) => {
        await recordAudit(
          tm,
          {
            userId: creator.id,
            organizationId: token.organizationId,
            requestId: String(req.id ?? '') || null,
          },
          {
            action: 'api_token.used',
            entityType: 'ApiToken',
            entityId: token.id,
            after: { method: req.method, path: req.originalUrl.split('?')[0].slice(0, 500) },
          },
        );
        await tm.update(ApiToken, { id: token.id }, { lastUsedAt: now });
      });

      req.user = Object.assign(creator, {
        roles: token.roles,
        organization: token.organization,
      }) as SessionUser;
      req.apiToken = { id: token.id, name: token.name };
      next();
    } catch (err) {
      next(err);
    }
  };

  /** Runs a session middleware only for requests without a bearer token. */
  const unlessToken =
    (mw: RequestHandler): RequestHandler =>
    (req, res, next) =>
      req.apiToken || hasBearer(req) ? next() : mw(req, res, next);

  return { authenticate, unlessToken };
}
