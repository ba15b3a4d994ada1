import { queryOptions } from '@tanstack/react-query';
import type { CreateSavedViewInput, SavedViewDto } from '../../../../shared/schemas/saved-views';
import { api } from '../../../lib/api-client';

export const savedViewQueries = {
  all: ['saved-views'] as const,
  list: () =>
    queryOptions({
      queryKey: ['saved-views', 'list'],
      queryFn: () => api<{ items: SavedViewDto[] }>('/saved-views'),
    }),
};

export const createSavedView = (input: CreateSavedViewInput) =>
  api<{ view: SavedViewDto }>('/saved-views', { method: 'POST', json: input });

export const deleteSavedView = (id: string) =>
  api<void>(`/saved-views/${encodeURIComponent(id)}`, { method: 'DELETE' });
