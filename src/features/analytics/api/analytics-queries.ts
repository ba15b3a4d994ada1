import { queryOptions, keepPreviousData } from '@tanstack/react-query';
import type {
  ClaimsAgeingDto,
  FailureModesDto,
  LifeAnalysisDto,
  ReserveDto,
} from '../../../../shared/schemas/analytics';
import { api, toQuery } from '../../../lib/api-client';

export type Population = { productModelId?: string; family?: string; lot?: string };
export type LifeFilters = Population & { ageUnit: 'months' | 'hours'; method: 'mle' | 'mrr' };

const hasPopulation = (p: Population) => Boolean(p.productModelId || p.family || p.lot);

export const analyticsQueries = {
  all: ['analytics'] as const,
  life: (f: LifeFilters) =>
    queryOptions({
      queryKey: ['analytics', 'life', f],
      queryFn: () => api<LifeAnalysisDto>(`/analytics/life${toQuery(f)}`),
      enabled: hasPopulation(f),
      placeholderData: keepPreviousData,
    }),
  failureModes: (p: Population & { factor: string }) =>
    queryOptions({
      queryKey: ['analytics', 'failure-modes', p],
      queryFn: () => api<FailureModesDto>(`/analytics/failure-modes${toQuery(p)}`),
      enabled: hasPopulation(p),
      placeholderData: keepPreviousData,
    }),
  claimsAgeing: () =>
    queryOptions({
      queryKey: ['analytics', 'claims-ageing'],
      queryFn: () => api<ClaimsAgeingDto>('/analytics/claims-ageing'),
    }),
  reserve: (months: number) =>
    queryOptions({
      queryKey: ['reserve', months],
      queryFn: () => api<ReserveDto>(`/reserve${toQuery({ months })}`),
    }),
};

/** The address of a table's CSV: the same query with format=csv and the table's name. */
export const csvUrl = (path: string, params: Record<string, string | number | undefined>) =>
  `/api${path}${toQuery({ ...params, format: 'csv' })}`;
