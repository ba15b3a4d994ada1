import type {
  ChangePasswordInput,
  ForgotPasswordInput,
  ResetPasswordInput,
} from '../../../../shared/schemas/auth';
import { api } from '../../../lib/api-client';

export const requestPasswordReset = (input: ForgotPasswordInput) =>
  api<{ ok: true; message: string }>('/auth/password/forgot', { method: 'POST', json: input });
export const resetPassword = (input: ResetPasswordInput) =>
  api<{ ok: true; email: string }>('/auth/password/reset', { method: 'POST', json: input });
export const changePassword = (input: ChangePasswordInput) =>
  api<{ ok: true }>('/auth/password/change', { method: 'POST', json: input });
