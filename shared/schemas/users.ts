import { z } from 'zod';
import { str } from './text';
import { ROLES, USER_STATUSES } from '../roles';
import { emailSchema } from './auth';
import { idSchema, instantSchema } from './answer-parts';

const rolesSchema = z
  .array(z.enum(ROLES, { error: 'Pick a known role.' }))
  .min(1, 'Give the user at least one role.')
  .max(ROLES.length)
  .refine((r) => new Set(r).size === r.length, 'Each role once.');

export const inviteUserSchema = z.strictObject({
  email: emailSchema,
  name: str().trim().min(1, 'Enter a name.').max(160, 'At most 160 characters.'),
  roles: rolesSchema,
});
export type InviteUserInput = z.infer<typeof inviteUserSchema>;

export const updateUserSchema = z
  .strictObject({
    name: str().trim().min(1, 'Enter a name.').max(160).optional(),
    roles: rolesSchema.optional(),
    status: z.enum(['active', 'disabled']).optional(),
  })
  .refine((v) => Object.keys(v).length > 0, 'Nothing to change.');
export type UpdateUserInput = z.infer<typeof updateUserSchema>;

export const listQuerySchema = z.strictObject({
  page: z.coerce.number().int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
  sort: str().max(40).optional(),
  q: str().trim().max(120).optional(),
});

export const userListQuerySchema = listQuerySchema.extend({
  status: z.enum(USER_STATUSES).optional(),
  sort: z.enum(['name', '-name', 'email', '-email', 'createdAt', '-createdAt']).default('name'),
});
export type UserListQuery = z.infer<typeof userListQuerySchema>;

export type Paginated<T> = { items: T[]; total: number; page: number; pageSize: number };

export const userSchema = z.object({
  id: idSchema,
  email: z.string(),
  name: z.string(),
  roles: z.array(z.enum(ROLES)),
  status: z.enum(USER_STATUSES),
  lastSignInAt: instantSchema.nullable(),
  createdAt: instantSchema,
});
export type UserDto = z.infer<typeof userSchema>;

export const meSchema = z.object({
  id: idSchema,
  email: z.string(),
  name: z.string(),
  roles: z.array(z.enum(ROLES)),
  organization: z.object({
    id: idSchema,
    name: z.string(),
    kind: z.enum(['manufacturer', 'contractor']),
    /** IANA zone every time is shown in (shared/dates.ts). */
    timeZone: z.string(),
    /** Locale of the PDFs and e-mails the organisation receives. */
    locale: z.string(),
  }),
});
export type MeDto = z.infer<typeof meSchema>;
