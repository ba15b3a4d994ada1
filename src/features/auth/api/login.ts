import type { LoginInput } from '../../../../shared/schemas/auth';
import type { MeDto } from '../../../../shared/schemas/users';
import { api } from '../../../lib/api-client';

/** Signs in, or (for a person with a second factor) answers that a code is needed next. */
export const login = (input: LoginInput) =>
  api<{ user: MeDto } | { secondFactor: 'required' }>('/auth/login', { method: 'POST', json: input });

/** The sign-in's second step: a code from the authenticator app, or a recovery code. */
export const loginSecondFactor = (code: string) =>
  api<{ user: MeDto }>('/auth/login/second-factor', { method: 'POST', json: { code } });
