import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import type { ClaimDetailDto, ClaimListItemDto } from '../../../../shared/schemas/claims';
import type { InstallationDto } from '../../../../shared/schemas/catalogue';
import type { Paginated } from '../../../../shared/schemas/users';
import { api, toQuery } from '../../../lib/api-client';

export type ClaimFilters = {
  page: number;
  pageSize?: number;
  q?: string;
  stage?: string;
  site?: string;
  product?: string;
  filedFrom?: string;
  filedTo?: string;
  open?: 'true' | 'false';
  sort?: string;
};

export const claimQueries = {
  all: ['claims'] as const,
  list: (f: ClaimFilters) =>
    queryOptions({
      queryKey: ['claims', 'list', f],
      queryFn: () => api<Paginated<ClaimListItemDto>>(`/claims${toQuery({ pageSize: 25, ...f })}`),
      placeholderData: keepPreviousData,
    }),
  detail: (id: string) =>
    queryOptions({
      queryKey: ['claims', 'detail', id],
      queryFn: () => api<{ claim: ClaimDetailDto }>(`/claims/${encodeURIComponent(id)}`),
    }),
  /** Installations to start a claim from (the contractor's own). */
  installations: (q: string) =>
    queryOptions({
      queryKey: ['claims', 'installations', q],
      queryFn: () =>
        api<Paginated<InstallationDto>>(
          `/installations${toQuery({ q, pageSize: 20, sort: '-installDate' })}`,
        ),
      placeholderData: keepPreviousData,
    }),
};
