import type { InviteUserInput } from '../../../../shared/schemas/users';
import { api } from '../../../lib/api-client';

export const inviteUser = (input: InviteUserInput) =>
  // 202 with the request as taken: the answer never says whether the address has an account elsewhere.
  api<{ invitation: Pick<InviteUserInput, 'email' | 'name' | 'roles'> }>('/users/invitations', {
    method: 'POST',
    json: input,
  });
