import type { OrganizationDto, UpdateOrganizationInput } from '../../../../shared/schemas/organizations';
import { api } from '../../../lib/api-client';

export const organizationQueries = {
  all: ['organizations'] as const,
  current: () => ({
    queryKey: ['organizations', 'current'] as const,
    queryFn: () => api<{ organization: OrganizationDto }>('/organizations/current'),
  }),
};

/** Any of the organisation's settings: zone and locale of dates, the credit second-approval amount. */
export const updateOrganization = (input: UpdateOrganizationInput) =>
  api<{ organization: OrganizationDto }>('/organizations/current', { method: 'PATCH', json: input });
