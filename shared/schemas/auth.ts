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
