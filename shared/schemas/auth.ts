import { z } from 'zod';

export const emailSchema = z
  .string({ error: 'Enter an e-mail address.' })
  .trim()
  .toLowerCase()
  .max(254, 'An e-mail address has at most 254 characters.')
  .pipe(z.email({ error: 'Enter a valid e-mail address.' }));

export const loginSchema = z.strictObject({
  email: emailSchema,
  password: z.string({ error: 'Enter your password.' }).min(1, 'Enter your password.').max(1024),
});
export type LoginInput = z.infer<typeof loginSchema>;

export const newPasswordSchema = z
  .string({ error: 'Choose a password.' })
  .min(12, 'Use at least 12 characters.')
  .max(256, 'Use at most 256 characters.');

export const acceptInvitationSchema = z.strictObject({
  name: z.string().trim().min(1, 'Enter your name.').max(160).optional(),
  password: newPasswordSchema,
});
export type AcceptInvitationInput = z.infer<typeof acceptInvitationSchema>;

// Password recovery and change (issue 13). The server also refuses a password found in a list of commonly used
// ones (server/auth/password-policy.ts): the list is too large to ship to the browser.
export const PASSWORD_MIN_LENGTH = 12;
export const PASSWORD_RESET_MINUTES = 30;

export const resetTokenSchema = z.string().regex(/^[A-Za-z0-9_-]{20,100}$/, 'Not a valid link.');

export const forgotPasswordSchema = z.strictObject({ email: emailSchema });
export type ForgotPasswordInput = z.infer<typeof forgotPasswordSchema>;

export const resetPasswordSchema = z.strictObject({ token: resetTokenSchema, password: newPasswordSchema });
export type ResetPasswordInput = z.infer<typeof resetPasswordSchema>;

export const changePasswordSchema = z.strictObject({
  currentPassword: z
    .string({ error: 'Enter your current password.' })
    .min(1, 'Enter your current password.')
    .max(1024),
  newPassword: newPasswordSchema,
});
export type ChangePasswordInput = z.infer<typeof changePasswordSchema>;

const repeatMatches = (v: { password: string; repeat: string }) => v.password === v.repeat;
const repeatIssue = { message: 'The two passwords differ.', path: ['repeat'] };

/** The reset page's form: the new password twice (only the first is sent). */
export const resetPasswordFormSchema = z
  .strictObject({ password: newPasswordSchema, repeat: z.string() })
  .refine(repeatMatches, repeatIssue);
export type ResetPasswordForm = z.infer<typeof resetPasswordFormSchema>;

/** The account page's form: the current password and the new one twice. */
export const changePasswordFormSchema = z
  .strictObject({
    currentPassword: changePasswordSchema.shape.currentPassword,
    password: newPasswordSchema,
    repeat: z.string(),
  })
  .refine(repeatMatches, repeatIssue);
export type ChangePasswordForm = z.infer<typeof changePasswordFormSchema>;
