import type { PolicyDetailDto, PolicyDto } from '../../../../shared/schemas/catalogue';
import { resourceQueries } from './resource-queries';

export type PolicyFilters = {
  page: number;
  q?: string;
  manufacturerId?: string;
  productModelId?: string;
  sort?: string;
};

export const policyQueries = resourceQueries<PolicyFilters, PolicyDto, { policy: PolicyDetailDto }>(
  'policies',
);
