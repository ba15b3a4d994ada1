import type { LoginInput } from '../../../../shared/schemas/auth';
import type { MeDto } from '../../../../shared/schemas/users';
import { api } from '../../../lib/api-client';

export const login = (input: LoginInput) =>
  api<{ user: MeDto }>('/auth/login', { method: 'POST', json: input });
