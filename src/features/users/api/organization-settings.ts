import type {
  OrganizationSettingsDto,
  OrganizationSettingsInput,
} from '../../../../shared/schemas/organizations';
import { api } from '../../../lib/api-client';

export const organizationQueries = {
  all: ['organizations'] as const,
  current: () => ({
    queryKey: ['organizations', 'current'] as const,
    queryFn: () => api<{ organization: OrganizationSettingsDto }>('/organizations/current'),
  }),
};

export const saveOrganizationSettings = (input: OrganizationSettingsInput) =>
  api<{ organization: OrganizationSettingsDto }>('/organizations/current', { method: 'PATCH', json: input });
