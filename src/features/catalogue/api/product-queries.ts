import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import type { HistoryEventDto, ProductDto } from '../../../../shared/schemas/catalogue';
import type { Paginated } from '../../../../shared/schemas/users';
import { api, toQuery } from '../../../lib/api-client';

export type ProductFilters = { page: number; pageSize?: number; q?: string; family?: string; location?: string; dimming?: string; manufacturerId?: string; sort?: string };

export const productQueries = {
  all: ['products'] as const,
  list: (f: ProductFilters) =>
    queryOptions({
      queryKey: ['products', 'list', f],
      queryFn: () => api<Paginated<ProductDto>>(`/products${toQuery({ pageSize: 25, ...f })}`),
      placeholderData: keepPreviousData,
    }),
  detail: (id: string) => queryOptions({ queryKey: ['products', 'detail', id], queryFn: () => api<{ product: ProductDto }>(`/products/${encodeURIComponent(id)}`) }),
  history: (id: string) =>
    queryOptions({ queryKey: ['products', 'history', id], queryFn: () => api<{ items: HistoryEventDto[] }>(`/products/${encodeURIComponent(id)}/history`) }),
};
