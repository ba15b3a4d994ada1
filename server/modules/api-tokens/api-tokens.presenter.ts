import type { ApiTokenView } from '../../../shared/schemas/api-tokens';
import type { ApiToken } from '../../db/entities/api-token.entity';
import { apiTokenState } from './api-tokens.service';

export function presentApiToken(t: ApiToken): ApiTokenView {
  return {
    id: t.id,
    name: t.name,
    roles: t.roles,
    hint: t.hint,
    createdAt: t.createdAt.toISOString(),
    createdBy: t.createdBy ? { id: t.createdBy.id, name: t.createdBy.name } : null,
    expiresAt: t.expiresAt.toISOString(),
    lastUsedAt: t.lastUsedAt ? t.lastUsedAt.toISOString() : null,
    revokedAt: t.revokedAt ? t.revokedAt.toISOString() : null,
    state: apiTokenState(t),
  };
}
