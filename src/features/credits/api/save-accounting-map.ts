import type { AccountingMapDto, AccountingMapInput } from '../../../../shared/schemas/credits';
import { api } from '../../../lib/api-client';

export const saveAccountingMap = (input: AccountingMapInput) =>
  api<{ accountingMap: AccountingMapDto }>('/credits/accounting-map', { method: 'PUT', json: input });
