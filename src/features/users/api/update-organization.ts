import type { OrganizationDto, UpdateOrganizationInput } from '../../../../shared/schemas/organizations';
import { api } from '../../../lib/api-client';

export const updateOrganization = (input: UpdateOrganizationInput) =>
  api<{ organization: OrganizationDto }>('/organization', { method: 'PATCH', json: input });
