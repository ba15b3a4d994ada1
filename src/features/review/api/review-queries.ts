import { queryOptions } from '@tanstack/react-query';
import type {
  ClaimWorkflowDto,
  DeskOptionDto,
  QueueItemDto,
  QueueSummaryDto,
} from '../../../../shared/claims/workflow';
import type { ProductDto } from '../../../../shared/schemas/catalogue';
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
  productModelId?: string;
  contractorId?: string;
  page?: number;
};

/** The most product models the queue's picker lists (the products list's largest page). */
export const PRODUCT_PICKER_LIMIT = 200;

export const reviewQueries = {
  queue: (filters: QueueFilters) =>
    queryOptions({
      queryKey: ['claims', 'queue', filters],
      queryFn: () => api<Paginated<QueueItemDto>>(`/review/queue${toQuery({ pageSize: 25, ...filters })}`),
      placeholderData: (prev) => prev,
    }),
  /** The manufacturer's own product models, for the queue's product filter. */
  products: (manufacturerId: string) =>
    queryOptions({
      queryKey: ['products', 'list', { manufacturerId, picker: true }],
      queryFn: () =>
        api<Paginated<ProductDto>>(
          `/products${toQuery({ manufacturerId, pageSize: PRODUCT_PICKER_LIMIT, sort: 'modelNumber' })}`,
        ),
      staleTime: 60_000,
    }),
  /** The contractors with claims on this manufacturer, for the queue's contractor filter. */
  contractors: () =>
    queryOptions({
      queryKey: ['claims', 'contractors'],
      queryFn: () => api<{ items: DeskOptionDto[]; more: boolean }>('/review/contractors'),
      staleTime: 60_000,
    }),
  /** The organisation's active reviewers: whom a claim can be handed to. */
  reviewers: () =>
    queryOptions({
      queryKey: ['users', 'reviewers'],
      queryFn: () => api<{ items: DeskOptionDto[] }>('/review/reviewers'),
      staleTime: 60_000,
    }),
  summary: () =>
    queryOptions({ queryKey: ['claims', 'summary'], queryFn: () => api<QueueSummaryDto>('/review/summary') }),
  workflow: (id: string) =>
    queryOptions({
      queryKey: ['claims', 'workflow', id],
      queryFn: () => api<ClaimWorkflowDto>(`/claims/${id}/workflow`),
    }),
  /**
   * The claim itself. Its key is the claims feature's, so the cached answer must keep that feature's shape
   * ({ claim }); `select` gives this feature the claim alone.
   */
  detail: (id: string) =>
    queryOptions({
      queryKey: ['claims', 'detail', id],
      queryFn: () => api<{ claim: ClaimDetailDto }>(`/claims/${encodeURIComponent(id)}`),
      select: (r) => r.claim,
    }),
};
