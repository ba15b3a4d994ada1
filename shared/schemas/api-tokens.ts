import { z } from 'zod';
import { str } from './text';
import { ROLES } from '../roles';

/** Every token starts with this, so secret scanners and people recognise a Lumenproof token. */
export const API_TOKEN_PREFIX = 'lpt_';
export const API_TOKEN_MAX_DAYS = 366;

export const createApiTokenSchema = z.strictObject({
  name: str().trim().min(1, 'Enter a name.').max(100, 'At most 100 characters.'),
  roles: z
    .array(z.enum(ROLES, { error: 'Pick a known role.' }))
    .min(1, 'Give the token at least one role.')
    .max(ROLES.length)
    .refine((r) => new Set(r).size === r.length, 'Each role once.'),
  expiresInDays: z
    .number({ error: 'Enter a number of days.' })
    .int('Whole days.')
    .min(1, 'At least one day.')
    .max(API_TOKEN_MAX_DAYS, `At most ${API_TOKEN_MAX_DAYS} days.`),
});
export type CreateApiTokenInput = z.infer<typeof createApiTokenSchema>;

export type ApiTokenView = {
  id: string;
  name: string;
  roles: string[];
  hint: string;
  createdAt: string;
  createdBy: { id: string; name: string } | null;
  expiresAt: string;
  lastUsedAt: string | null;
  revokedAt: string | null;
  state: 'active' | 'expired' | 'revoked';
};
