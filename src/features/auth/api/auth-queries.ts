import { queryOptions } from '@tanstack/react-query';
import type { MeDto } from '../../../../shared/schemas/users';
import { api, ApiError } from '../../../lib/api-client';

export type SessionDto = {
  user: MeDto;
  app: { mode: 'demo' | 'production' };
  /** Whether the person has a second factor and must have one (then they are held at /security until they do). */
  secondFactor?: { enrolled: boolean; required: boolean };
};

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
