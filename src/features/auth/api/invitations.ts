import type { AcceptInvitationInput } from '../../../../shared/schemas/auth';
import { api } from '../../../lib/api-client';

export type InvitationDto = {
  email: string;
  name: string;
  organization: { name: string; kind: string };
  expiresAt: string;
};

export const getInvitation = (token: string) =>
  api<{ invitation: InvitationDto }>(`/invitations/${encodeURIComponent(token)}`);
export const acceptInvitation = (token: string, input: AcceptInvitationInput) =>
  api<{ ok: true; email: string }>(`/invitations/${encodeURIComponent(token)}/accept`, {
    method: 'POST',
    json: input,
  });
