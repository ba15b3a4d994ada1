import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import type { HistoryEventDto } from '../../../../shared/schemas/catalogue';
import type { Paginated } from '../../../../shared/schemas/users';
import { api, toQuery } from '../../../lib/api-client';

/**
 * The query options of a catalogue resource (`/api/products`, `/api/installations`, `/api/policies`): the paged
 * list, one record and its history, under keys `[resource, 'list' | 'detail' | 'history', …]`.
 */
export function resourceQueries<Filters extends { page: number }, Item, DetailAnswer>(
  resource: 'products' | 'installations' | 'policies',
) {
  const path = (id: string) => `/${resource}/${encodeURIComponent(id)}`;
  return {
    all: [resource] as const,
    list: (f: Filters) =>
      queryOptions({
        queryKey: [resource, 'list', f],
        queryFn: () => api<Paginated<Item>>(`/${resource}${toQuery({ pageSize: 25, ...f })}`),
        placeholderData: keepPreviousData,
      }),
    detail: (id: string) =>
      queryOptions({ queryKey: [resource, 'detail', id], queryFn: () => api<DetailAnswer>(path(id)) }),
    history: (id: string) =>
      queryOptions({
        queryKey: [resource, 'history', id],
        queryFn: () => api<{ items: HistoryEventDto[] }>(`${path(id)}/history`),
      }),
  };
}
