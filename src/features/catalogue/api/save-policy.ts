import type {
  CreatePolicyInput,
  PolicyDetailDto,
  PolicyTermsInput,
  PolicyVersionDto,
} from '../../../../shared/schemas/catalogue';
import { api } from '../../../lib/api-client';

export const createPolicy = (input: CreatePolicyInput) =>
  api<{ policy: PolicyDetailDto }>('/policies', { method: 'POST', json: input });

export const addPolicyVersion = (id: string, terms: PolicyTermsInput) =>
  api<{ policy: PolicyDetailDto; version: PolicyVersionDto }>(
    `/policies/${encodeURIComponent(id)}/versions`,
    { method: 'POST', json: terms },
  );
