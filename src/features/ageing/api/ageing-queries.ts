import { queryOptions } from '@tanstack/react-query';
import type { AgeingDto, StageTargets } from '../../../../shared/schemas/ageing';
import { api } from '../../../lib/api-client';

export const ageingQueries = {
  all: ['ageing'] as const,
  view: () => queryOptions({ queryKey: ['ageing', 'view'], queryFn: () => api<AgeingDto>('/ageing') }),
};

export const setStageTargets = (targets: StageTargets) =>
  api<AgeingDto>('/ageing/targets', { method: 'PUT', json: { targets } });

export const AGEING_CSV_URL = '/api/ageing/export';
