import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import type { Paginated, UserDto } from '../../../../shared/schemas/users';
import { api, toQuery } from '../../../lib/api-client';

export type UserFilters = { page: number; q?: string; status?: string; sort?: string };

export const userQueries = {
  all: ['users'] as const,
  list: (f: UserFilters) =>
    queryOptions({
      queryKey: ['users', 'list', f],
      queryFn: () => api<Paginated<UserDto>>(`/users${toQuery({ ...f, pageSize: 25 })}`),
      placeholderData: keepPreviousData,
    }),
};
