import { queryOptions } from '@tanstack/react-query';
import { api, ApiError } from '../../../lib/api-client';
import type { SessionDto } from '../../../lib/session';

export const authQueries = {
  me: () =>
    queryOptions({
      queryKey: ['auth', 'me'],
      queryFn: async (): Promise<SessionDto | null> => {
        try {
          return await api<SessionDto>('/auth/me');
        } catch (e) {
          if (e instanceof ApiError && e.status === 401) return null;
          throw e;
        }
      },
      staleTime: 60_000,
    }),
};
