import type { InviteUserInput, UserDto } from '../../../../shared/schemas/users';
import { api } from '../../../lib/api-client';

export const inviteUser = (input: InviteUserInput) =>
  api<{ user: UserDto }>('/users/invitations', { method: 'POST', json: input });
