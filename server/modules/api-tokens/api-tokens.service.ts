import crypto from 'node:crypto';
import { API_TOKEN_PREFIX, type CreateApiTokenInput } from '../../../shared/schemas/api-tokens';
import { ROLES_BY_KIND } from '../../../shared/roles';
import type { SessionUser } from '../../auth/passport';
import type { AppDataSource } from '../../db/data-source';
import { ApiToken } from '../../db/entities/api-token.entity';
import { recordAudit, type Actor } from '../../lib/audit';
import { clock } from '../../lib/clock';
import { AppError } from '../../lib/errors';

// A token reads `lpt_<the row's id as 32 hex digits>_<43 characters of base64url: 256 random bits>`. The id part
// lets the server load the row by primary key; only the SHA-256 of the whole token is stored and compared.
const TOKEN_PATTERN = /^lpt_([0-9a-f]{32})_([A-Za-z0-9_-]{43})$/;

export const hashApiToken = (token: string) => crypto.createHash('sha256').update(token).digest('hex');

const hexOf = (uuid: string) => uuid.replace(/-/g, '');
const uuidOf = (hex: string) =>
  `${hex.slice(0, 8)}-${hex.slice(8, 12)}-${hex.slice(12, 16)}-${hex.slice(16, 20)}-${hex.slice(20)}`;

/** The row id a presented token names, or null when it is not shaped like one of ours. */
export function parseApiToken(token: string): { id: string } | null {
  const m = TOKEN_PATTERN.exec(token);
  return m ? { id: uuidOf(m[1]) } : null;
}

/** Whether a presented token is the one whose hash is stored (constant time). */
export function apiTokenMatches(token: string, secretHash: string) {
  const a = Buffer.from(hashApiToken(token), 'hex');
  const b = Buffer.from(secretHash, 'hex');
  return a.length === b.length && crypto.timingSafeEqual(a, b);
}

export function apiTokenState(t: ApiToken, now = clock.now()): 'active' | 'expired' | 'revoked' {
  if (t.revokedAt) return 'revoked';
  if (t.expiresAt.getTime() <= now.getTime()) return 'expired';
  return 'active';
}

const auditView = (t: ApiToken) => ({
  name: t.name,
  roles: t.roles,
  hint: t.hint,
  expiresAt: t.expiresAt.toISOString(),
});

export function createApiTokensService(ds: AppDataSource) {
  const repo = ds.getRepository(ApiToken);
  return {
    list(organizationId: string) {
      return repo.find({
        where: { organizationId },
        relations: { createdBy: true },
        order: { createdAt: 'DESC' },
        take: 500,
      });
    },

    findById(id: string) {
      return repo.findOne({ where: { id }, relations: { createdBy: true } });
    },

    /** Makes a token and returns it with its secret: the only time the secret exists outside the caller. */
    async create(admin: SessionUser, input: CreateApiTokenInput, actor: Actor) {
      const allowed = ROLES_BY_KIND[admin.organization.kind];
      const foreign = input.roles.filter((r) => !allowed.includes(r));
      if (foreign.length) {
        throw new AppError(
          422,
          'api_token.role_not_allowed',
          'A token can only have roles your organisation has.',
          [{ path: 'roles', message: `Not a role in this organisation: ${foreign.join(', ')}.` }],
        );
      }
      const id = crypto.randomUUID();
      const secret = `${API_TOKEN_PREFIX}${hexOf(id)}_${crypto.randomBytes(32).toString('base64url')}`;
      const now = clock.now();
      return ds.transaction(async (m) => {
        const token = m.create(ApiToken, {
          id,
          organizationId: admin.organizationId,
          name: input.name,
          roles: input.roles,
          secretHash: hashApiToken(secret),
          hint: `${API_TOKEN_PREFIX}${hexOf(id).slice(0, 8)}`,
          createdById: admin.id,
          expiresAt: new Date(now.getTime() + input.expiresInDays * 86_400_000),
          lastUsedAt: null,
          revokedAt: null,
          revokedById: null,
        });
        await m.insert(ApiToken, token);
        await recordAudit(m, actor, {
          action: 'api_token.created',
          entityType: 'ApiToken',
          entityId: id,
          after: auditView(token),
        });
        const saved = await m.findOneOrFail(ApiToken, { where: { id }, relations: { createdBy: true } });
        return { token: saved, secret };
      });
    },

    /** Revoking twice changes nothing the second time. */
    async revoke(admin: SessionUser, token: ApiToken, actor: Actor) {
      if (token.revokedAt) return token;
      return ds.transaction(async (m) => {
        const now = clock.now();
        await m.update(ApiToken, { id: token.id }, { revokedAt: now, revokedById: admin.id });
        await recordAudit(m, actor, {
          action: 'api_token.revoked',
          entityType: 'ApiToken',
          entityId: token.id,
          before: { revokedAt: null },
          after: { ...auditView(token), revokedAt: now.toISOString() },
        });
        return m.findOneOrFail(ApiToken, { where: { id: token.id }, relations: { createdBy: true } });
      });
    },
  };
}
