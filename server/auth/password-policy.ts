import { dictionary } from '@zxcvbn-ts/language-common';
import { PASSWORD_MIN_LENGTH } from '../../shared/schemas/auth';
import { AppError } from '../lib/errors';

// What a new password must be (NIST SP 800-63B §5.1.1.2): at least PASSWORD_MIN_LENGTH characters (NIST asks
// for 8 when the user chooses; 12 here, and the forms suggest a short sentence), at most 256, no composition
// rules, and not one of the commonly used passwords: the 49,233 in @zxcvbn-ts/language-common's
// 'passwords-common' list (drawn from leaked-password corpora), compared without case. Nor the account's own
// e-mail address or its part before the @ (a context-specific word, §5.1.1.2).
// The length limits are in the shared zod schema (newPasswordSchema) so that the forms say them too.

const COMMON = new Set(dictionary['passwords-common'].map((p) => p.toLowerCase()));

export const isCommonPassword = (password: string) => COMMON.has(password.toLowerCase());

/** Why the password may not be used, or null. */
export function passwordProblem(password: string, email?: string): string | null {
  if (password.length < PASSWORD_MIN_LENGTH) return `Use at least ${PASSWORD_MIN_LENGTH} characters.`;
  if (isCommonPassword(password) || isCommonPassword(password.trim()))
    return 'This password is on a list of commonly used passwords. Choose another; a short sentence works well.';
  if (email) {
    const lower = password.toLowerCase();
    const local = email.toLowerCase().split('@')[0];
    if (lower === email.toLowerCase() || (local.length >= 4 && lower.includes(local)))
      return 'Do not use your e-mail address in your password.';
  }
  return null;
}

/** Throws a 400 naming the field unless the password may be used. */
export function assertPasswordAllowed(password: string, field: string, email?: string) {
  const problem = passwordProblem(password, email);
  if (problem)
    throw new AppError(400, 'validation.failed', 'The request body has invalid fields.', [
      { path: field, message: problem },
    ]);
}
