import { z } from 'zod';
import { str } from './text';
import { listQuerySchema } from './users';
import { idSchema, instantSchema, orgRefSchema } from './answer-parts';

// A six-digit code from an authenticator app, or a recovery code (ten letters and digits, a dash allowed).
export const secondFactorCodeSchema = z
  .string({ error: 'Enter the code from your authenticator app.' })
  .trim()
  .min(6, 'Enter the code from your authenticator app.')
  .max(24, 'That code is too long.')
  .regex(/^[0-9A-Za-z -]+$/, 'A code has only digits, letters and dashes.');

export const secondFactorLoginSchema = z.strictObject({ code: secondFactorCodeSchema });
export type SecondFactorLoginInput = z.infer<typeof secondFactorLoginSchema>;

export const confirmEnrollmentSchema = z.strictObject({
  code: str({ error: 'Enter the six-digit code.' })
    .trim()
    .regex(/^\d{6}$/, 'Enter the six-digit code.'),
});
export type ConfirmEnrollmentInput = z.infer<typeof confirmEnrollmentSchema>;

export const removeSecondFactorSchema = z.strictObject({
  password: str({ error: 'Enter your password.' }).min(1, 'Enter your password.').max(1024),
});
export type RemoveSecondFactorInput = z.infer<typeof removeSecondFactorSchema>;

export const organizationSecuritySchema = z.strictObject({
  requireSecondFactor: z.boolean({ error: 'Say whether a second factor is required.' }),
});
export type OrganizationSecurityInput = z.infer<typeof organizationSecuritySchema>;

/** The answer of GET|PATCH /api/organizations/current/security: the organisation's sign-in rules. */
export const organizationSecurityAnswerSchema = z.object({ id: idSchema, requireSecondFactor: z.boolean() });
export type OrganizationSecurityDto = z.infer<typeof organizationSecurityAnswerSchema>;

/** `secondFactor` of GET /api/auth/me: whether this person has one, and whether they must. */
export const meSecondFactorSchema = z.object({ enrolled: z.boolean(), required: z.boolean() });
export type MeSecondFactor = z.infer<typeof meSecondFactorSchema>;

/** The audit actions the security events page lists (some are written by the sign-in and password code). */
export const SECURITY_EVENT_ACTIONS = [
  'user.signed_in',
  'user.sign_in_failed',
  'user.locked_out',
  'user.password_reset_requested',
  'user.password_reset',
  'user.password_changed',
  'user.second_factor_added',
  'user.second_factor_removed',
  'user.second_factor_reset',
  'user.recovery_code_used',
  'user.sessions_ended',
  'user.roles_changed',
  'user.disabled',
  'user.enabled',
  'organization.second_factor_policy_changed',
] as const;
export type SecurityEventAction = (typeof SECURITY_EVENT_ACTIONS)[number];

export const SECURITY_EVENT_LABELS: Record<SecurityEventAction, string> = {
  'user.signed_in': 'Signed in',
  'user.sign_in_failed': 'Sign-in failed',
  'user.locked_out': 'Locked out',
  'user.password_reset_requested': 'Password reset requested',
  'user.password_reset': 'Password reset',
  'user.password_changed': 'Password changed',
  'user.second_factor_added': 'Second factor added',
  'user.second_factor_removed': 'Second factor removed',
  'user.second_factor_reset': 'Second factor reset by an administrator',
  'user.recovery_code_used': 'Recovery code used',
  'user.sessions_ended': 'Signed out other sessions',
  'user.roles_changed': 'Roles changed',
  'user.disabled': 'Account disabled',
  'user.enabled': 'Account enabled',
  'organization.second_factor_policy_changed': 'Second factor policy changed',
};

export const securityEventsQuerySchema = listQuerySchema.pick({ page: true, pageSize: true }).extend({
  userId: z.uuid({ error: 'Not a valid person.' }).optional(),
  action: z.enum(SECURITY_EVENT_ACTIONS, { error: 'Pick a known kind of event.' }).optional(),
});
export type SecurityEventsQuery = z.infer<typeof securityEventsQuerySchema>;

export const securityEventSchema = z.object({
  /** The audit row's number. */
  id: z.string(),
  occurredAt: instantSchema,
  action: z.enum(SECURITY_EVENT_ACTIONS),
  /** The person the event is about (the account signed in, whose factor was reset). */
  subject: z.object({ id: idSchema, name: z.string(), email: z.string() }).nullable(),
  /** Who did it, when not the subject themself (an administrator's reset). */
  actor: orgRefSchema.nullable(),
  ip: z.string().nullable(),
});
export type SecurityEventDto = z.infer<typeof securityEventSchema>;

export const secondFactorStatusSchema = z.object({
  enrolled: z.boolean(),
  required: z.boolean(),
  recoveryCodesLeft: z.number().int().min(0),
});
export type SecondFactorStatusDto = z.infer<typeof secondFactorStatusSchema>;

export type EnrollmentDto = { secret: string; otpauthUrl: string; qrSvg: string };

export const sessionSchema = z.object({
  id: z.string(),
  device: z.string(),
  ip: z.string().nullable(),
  signedInAt: instantSchema.nullable(),
  lastSeenAt: instantSchema.nullable(),
  current: z.boolean(),
});
export type SessionDto = z.infer<typeof sessionSchema>;
