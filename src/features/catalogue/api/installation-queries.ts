import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import type { HistoryEventDto, InstallationDetailDto, InstallationDto } from '../../../../shared/schemas/catalogue';
import type { Paginated } from '../../../../shared/schemas/users';
import { api, toQuery } from '../../../lib/api-client';

export type InstallationFilters = { page: number; q?: string; location?: string; enclosure?: string; nominalSupplyVolts?: string; sort?: string };

export const installationQueries = {
  all: ['installations'] as const,
  list: (f: InstallationFilters) =>
    queryOptions({
      queryKey: ['installations', 'list', f],
      queryFn: () => api<Paginated<InstallationDto>>(`/installations${toQuery({ pageSize: 25, ...f })}`),
      placeholderData: keepPreviousData,
    }),
  detail: (id: string) =>
    queryOptions({ queryKey: ['installations', 'detail', id], queryFn: () => api<{ installation: InstallationDetailDto }>(`/installations/${encodeURIComponent(id)}`) }),
  history: (id: string) =>
    queryOptions({ queryKey: ['installations', 'history', id], queryFn: () => api<{ items: HistoryEventDto[] }>(`/installations/${encodeURIComponent(id)}/history`) }),
};
