import { queryOptions } from '@tanstack/react-query';
import type { WaitingListDto, WaitingMailMode } from '../../../../shared/schemas/waiting';
import { api } from '../../../lib/api-client';

export const waitingQueries = {
  all: ['waiting'] as const,
  list: () =>
    queryOptions({
      queryKey: ['waiting', 'list'],
      queryFn: () => api<WaitingListDto>('/waiting'),
      // The bell is on every screen: look again each minute rather than on every render.
      staleTime: 30_000,
      refetchInterval: 60_000,
    }),
};

export const markWaitingRead = (keys: string[]) =>
  api<{ marked: number }>('/waiting/read', { method: 'POST', json: { keys } });

export const waitingMailQueries = {
  mode: () =>
    queryOptions({
      queryKey: ['waiting', 'email'],
      queryFn: () => api<{ mode: WaitingMailMode }>('/waiting/email'),
    }),
};

export const setWaitingMail = (mode: WaitingMailMode) =>
  api<{ mode: WaitingMailMode }>('/waiting/email', { method: 'PUT', json: { mode } });
