import type { ImportResult } from '../../../../shared/schemas/catalogue';
import { api } from '../../../lib/api-client';

export type ImportTarget = 'products' | 'installations';

/** Sends spreadsheet rows (already parsed in the browser) for a preview (dryRun) or the import itself. */
export const importRows = (
  target: ImportTarget,
  rows: Record<string, string>[],
  opts: { dryRun: boolean; firstRowNumber?: number; signal?: AbortSignal },
) =>
  api<ImportResult>(`/${target}/import?dryRun=${opts.dryRun}`, {
    method: 'POST',
    json: { rows, ...(opts.firstRowNumber ? { firstRowNumber: opts.firstRowNumber } : {}) },
    signal: opts.signal,
  });

export const templateUrl = (target: ImportTarget) => `/api/${target}/import-template`;
