import { keepPreviousData, queryOptions, type QueryClient } from '@tanstack/react-query';
import type { Paginated } from '../../../../shared/schemas/users';
import type {
  AccountingMapDto,
  BalanceDto,
  JournalDto,
  CreditMemoDto,
  QueueItemDto,
  WarrantyCostDto,
} from '../../../../shared/schemas/credits';
import { api, toQuery } from '../../../lib/api-client';

export type CreditFilters = {
  page: number;
  q?: string;
  kind?: string;
  from?: string;
  to?: string;
  sort?: string;
};
export type QueueFilters = { page: number; q?: string; currency?: string; minAgeDays?: string };
export type QueuePage = Paginated<QueueItemDto> & {
  totals: { currency: string; amount: string; claims: number }[];
};

export const creditQueries = {
  all: ['credits'] as const,
  list: (f: CreditFilters) =>
    queryOptions({
      queryKey: ['credits', 'list', f],
      queryFn: () => api<Paginated<CreditMemoDto>>(`/credits${toQuery({ ...f, pageSize: 25 })}`),
      placeholderData: keepPreviousData,
    }),
  queue: (f: QueueFilters) =>
    queryOptions({
      queryKey: ['credits', 'queue', f],
      queryFn: () => api<QueuePage>(`/credits/queue${toQuery({ ...f, pageSize: 50 })}`),
      placeholderData: keepPreviousData,
    }),
  balances: () =>
    queryOptions({
      queryKey: ['credits', 'balances'],
      queryFn: () => api<{ items: BalanceDto[] }>('/credits/balances'),
    }),
  accountingMap: () =>
    queryOptions({
      queryKey: ['credits', 'accounting-map'],
      queryFn: () => api<{ accountingMap: AccountingMapDto | null }>('/credits/accounting-map'),
    }),
  /** The journal's preview (its lines and totals) for the range; refused (409) until the accounts are mapped. */
  journal: (from: string, to: string) =>
    queryOptions({
      queryKey: ['credits', 'journal', { from, to }],
      queryFn: () => api<JournalDto>(`/credits/journal${toQuery({ from, to, format: 'json' })}`),
      retry: false,
    }),
  cost: (f: { from?: string; to?: string }) =>
    queryOptions({
      queryKey: ['credits', 'cost', f],
      queryFn: () => api<WarrantyCostDto>(`/credits/cost${toQuery(f)}`),
    }),
};

/**
 * What issuing or voiding a memo changes, by key prefix: the memo lists, queue and balances, and the claim's
 * own queries (its stage moves to credited or back to approved: its detail, workflow and list rows, which live
 * under 'claims' in the claims and review features), and the stage-derived waiting and ageing views.
 */
export const CREDIT_CHANGES = [creditQueries.all, ['claims'], ['waiting'], ['ageing']] as const;

export const invalidateAfterCredit = (qc: QueryClient) =>
  Promise.all(CREDIT_CHANGES.map((queryKey) => qc.invalidateQueries({ queryKey })));

export const creditPdfUrl = (id: string) => `/api/credits/${encodeURIComponent(id)}/pdf`;
export const creditExportUrl = (from: string, to: string) => `/api/credits/export${toQuery({ from, to })}`;
export const journalUrl = (from: string, to: string, format: 'csv' | 'sie', currency?: string) =>
  `/api/credits/journal${toQuery({ from, to, format, currency })}`;
