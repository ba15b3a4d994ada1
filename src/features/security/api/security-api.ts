import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import type {
  EnrollmentDto,
  SecondFactorStatusDto,
  SecurityEventDto,
  SessionDto,
} from '../../../../shared/schemas/security';
import type { Paginated, UserDto } from '../../../../shared/schemas/users';
import { api, toQuery } from '../../../lib/api-client';

export type SecurityEventFilters = { page: number; userId?: string; action?: string };

export const securityQueries = {
  all: ['security'] as const,
  secondFactor: () =>
    queryOptions({
      queryKey: ['security', 'second-factor'],
      queryFn: () => api<SecondFactorStatusDto>('/auth/second-factor'),
    }),
  sessions: () =>
    queryOptions({
      queryKey: ['security', 'sessions'],
      queryFn: () => api<{ items: SessionDto[] }>('/auth/sessions'),
    }),
  organization: () =>
    queryOptions({
      queryKey: ['security', 'organization'],
      queryFn: () =>
        api<{ organization: { id: string; requireSecondFactor: boolean } }>(
          '/organizations/current/security',
        ),
    }),
  events: (f: SecurityEventFilters) =>
    queryOptions({
      queryKey: ['security', 'events', f],
      queryFn: () => api<Paginated<SecurityEventDto>>(`/security-events${toQuery({ ...f, pageSize: 25 })}`),
      placeholderData: keepPreviousData,
    }),
  /** The people of the organisation, for the events page's person filter. */
  people: () =>
    queryOptions({
      queryKey: ['security', 'people'],
      queryFn: () => api<Paginated<UserDto>>('/users?pageSize=200&sort=name'),
      staleTime: 60_000,
    }),
};

export const startEnrollment = () =>
  api<EnrollmentDto>('/auth/second-factor/enrollment', { method: 'POST', json: {} });
export const confirmEnrollment = (code: string) =>
  api<{ recoveryCodes: string[] }>('/auth/second-factor/enrollment/confirm', {
    method: 'POST',
    json: { code },
  });
export const removeSecondFactor = (password: string) =>
  api<void>('/auth/second-factor', { method: 'DELETE', json: { password } });
export const endSession = (id: string) => api<void>(`/auth/sessions/${id}`, { method: 'DELETE' });
export const endOtherSessions = () =>
  api<{ ended: number }>('/auth/sessions/sign-out-others', { method: 'POST', json: {} });
export const setOrganizationSecurity = (requireSecondFactor: boolean) =>
  api<{ organization: { id: string; requireSecondFactor: boolean } }>('/organizations/current/security', {
    method: 'PATCH',
    json: { requireSecondFactor },
  });
