import type { UpdateUserInput, UserDto } from '../../../../shared/schemas/users';
import { api } from '../../../lib/api-client';

export const updateUser = (id: string, input: UpdateUserInput) =>
  api<{ user: UserDto }>(`/users/${encodeURIComponent(id)}`, { method: 'PATCH', json: input });
