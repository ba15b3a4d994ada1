import { queryOptions } from '@tanstack/react-query';
import type { ClaimWorkflowDto, QueueItemDto, QueueSummaryDto } from '../../../../shared/claims/workflow';
import type { ClaimDetailDto } from '../../../../shared/schemas/claims';
import type { Paginated } from '../../../../shared/schemas/users';
import { api, toQuery } from '../../../lib/api-client';

export type QueueFilters = {
  stage?: string;
  verdict?: string;
  waitingOn?: string;
  assignee?: string;
  q?: string;
  sort?: string;
  minAgeDays?: number;
  minAmount?: string;
  page?: number;
};

export const reviewQueries = {
  queue: (filters: QueueFilters) =>
    queryOptions({
      queryKey: ['claims', 'queue', filters],
      queryFn: () => api<Paginated<QueueItemDto>>(`/review/queue${toQuery({ pageSize: 25, ...filters })}`),
      placeholderData: (prev) => prev,
    }),
  summary: () => queryOptions({ queryKey: ['claims', 'summary'], queryFn: () => api<QueueSummaryDto>('/review/summary') }),
  workflow: (id: string) =>
    queryOptions({ queryKey: ['claims', 'workflow', id], queryFn: () => api<ClaimWorkflowDto>(`/claims/${id}/workflow`) }),
  detail: (id: string) =>
    queryOptions({ queryKey: ['claims', 'detail', id], queryFn: () => api<{ claim: ClaimDetailDto }>(`/claims/${id}`).then((r) => r.claim) }),
};
