import { z } from 'zod';
import { str } from './text';
import { ROLES } from '../roles';
import { idSchema, instantSchema, orgRefSchema } from './answer-parts';

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

export const apiTokenSchema = z.object({
  id: idSchema,
  name: z.string(),
  roles: z.array(z.enum(ROLES)),
  /** The token's last characters, to tell tokens apart; the secret itself is shown once. */
  hint: z.string(),
  createdAt: instantSchema,
  createdBy: orgRefSchema.nullable(),
  expiresAt: instantSchema,
  lastUsedAt: instantSchema.nullable(),
  revokedAt: instantSchema.nullable(),
  state: z.enum(['active', 'expired', 'revoked']),
});
export type ApiTokenView = z.infer<typeof apiTokenSchema>;
