import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import type { HistoryEventDto, PolicyDetailDto, PolicyDto } from '../../../../shared/schemas/catalogue';
import type { Paginated } from '../../../../shared/schemas/users';
import { api, toQuery } from '../../../lib/api-client';

export type PolicyFilters = { page: number; q?: string; manufacturerId?: string; productModelId?: string; sort?: string };

export const policyQueries = {
  all: ['policies'] as const,
  list: (f: PolicyFilters) =>
    queryOptions({
      queryKey: ['policies', 'list', f],
      queryFn: () => api<Paginated<PolicyDto>>(`/policies${toQuery({ pageSize: 25, ...f })}`),
      placeholderData: keepPreviousData,
    }),
  detail: (id: string) => queryOptions({ queryKey: ['policies', 'detail', id], queryFn: () => api<{ policy: PolicyDetailDto }>(`/policies/${encodeURIComponent(id)}`) }),
  history: (id: string) =>
    queryOptions({ queryKey: ['policies', 'history', id], queryFn: () => api<{ items: HistoryEventDto[] }>(`/policies/${encodeURIComponent(id)}/history`) }),
};
