import { z } from 'zod';
import { str } from './text';

export const emailSchema = str({ error: 'Enter an e-mail address.' })
  .trim()
  .toLowerCase()
  .max(254, 'An e-mail address has at most 254 characters.')
  .pipe(z.email({ error: 'Enter a valid e-mail address.' }));

export const loginSchema = z.strictObject({
  email: emailSchema,
  password: str({ error: 'Enter your password.' }).min(1, 'Enter your password.').max(1024),
});
export type LoginInput = z.infer<typeof loginSchema>;

export const newPasswordSchema = str({ error: 'Choose a password.' })
  .min(12, 'Use at least 12 characters.')
  .max(256, 'Use at most 256 characters.');

export const acceptInvitationSchema = z.strictObject({
  name: str().trim().min(1, 'Enter your name.').max(160).optional(),
  password: newPasswordSchema,
});
export type AcceptInvitationInput = z.infer<typeof acceptInvitationSchema>;

// Password recovery and change (issue 13). The server also refuses a password found in a list of commonly used
// ones (server/auth/password-policy.ts): the list is too large to ship to the browser.
export const PASSWORD_MIN_LENGTH = 12;
export const PASSWORD_RESET_MINUTES = 30;

export const resetTokenSchema = str().regex(/^[A-Za-z0-9_-]{20,100}$/, 'Not a valid link.');

export const forgotPasswordSchema = z.strictObject({ email: emailSchema });
export type ForgotPasswordInput = z.infer<typeof forgotPasswordSchema>;

export const resetPasswordSchema = z.strictObject({ token: resetTokenSchema, password: newPasswordSchema });
export type ResetPasswordInput = z.infer<typeof resetPasswordSchema>;

export const changePasswordSchema = z.strictObject({
  currentPassword: str({ error: 'Enter your current password.' })
    .min(1, 'Enter your current password.')
    .max(1024),
  newPassword: newPasswordSchema,
});
export type ChangePasswordInput = z.infer<typeof changePasswordSchema>;

const repeatMatches = (v: { password: string; repeat: string }) => v.password === v.repeat;
const repeatIssue = { message: 'The two passwords differ.', path: ['repeat'] };

/** The reset page's form: the new password twice (only the first is sent). */
export const resetPasswordFormSchema = z
  .strictObject({ password: newPasswordSchema, repeat: str() })
  .refine(repeatMatches, repeatIssue);
export type ResetPasswordForm = z.infer<typeof resetPasswordFormSchema>;

/** The account page's form: the current password and the new one twice. */
export const changePasswordFormSchema = z
  .strictObject({
    currentPassword: changePasswordSchema.shape.currentPassword,
    password: newPasswordSchema,
    repeat: str(),
  })
  .refine(repeatMatches, repeatIssue);
export type ChangePasswordForm = z.infer<typeof changePasswordFormSchema>;
