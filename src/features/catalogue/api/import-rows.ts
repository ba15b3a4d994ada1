import type { ImportResult } from '../../../../shared/schemas/catalogue';
import { api, ApiError, type ApiErrorBody } from '../../../lib/api-client';

export type ImportTarget = 'products' | 'installations';

/** How far the server has got with an import (server/lib/import-stream.ts). */
export type ImportProgress = { phase: 'checking' | 'writing'; done: number; total: number };

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

/**
 * The import itself, asking the server for its progress as it goes (NDJSON lines: progress, then the result or an
 * error). A server answering plain JSON (an import without progress, or a refusal) is read as `importRows` would.
 */
export async function importRowsWithProgress(
  target: ImportTarget,
  rows: Record<string, string>[],
  opts: { signal?: AbortSignal; onProgress: (p: ImportProgress) => void },
): Promise<ImportResult> {
  let res: Response;
  try {
    res = await fetch(`/api/${target}/import?dryRun=false`, {
      method: 'POST',
      credentials: 'same-origin',
      headers: { Accept: 'application/x-ndjson, application/json', 'Content-Type': 'application/json' },
      body: JSON.stringify({ rows }),
      signal: opts.signal,
    });
  } catch (e) {
    if ((e as Error).name === 'AbortError') throw e;
    throw new ApiError(0, 'network.offline', 'Cannot reach Lumenproof. Check the connection and try again.');
  }
  const streamed = res.ok && (res.headers.get('content-type') ?? '').includes('application/x-ndjson');
  if (!streamed || !res.body) {
    const text = await res.text();
    const body = text ? (JSON.parse(text) as unknown) : undefined;
    if (!res.ok) {
      const err = (body as { error?: ApiErrorBody } | undefined)?.error;
      throw new ApiError(
        res.status,
        err?.code ?? 'http.error',
        err?.message ?? `The server answered ${res.status}.`,
      );
    }
    return body as ImportResult;
  }
  const reader = res.body.pipeThrough(new TextDecoderStream()).getReader();
  let buffered = '';
  for (;;) {
    const { value, done } = await reader.read();
    buffered += value ?? '';
    const lines = buffered.split('\n');
    buffered = lines.pop() ?? '';
    for (const l of lines) {
      if (!l.trim()) continue;
      const msg = JSON.parse(l) as { progress?: ImportProgress; result?: ImportResult; error?: ApiErrorBody };
      if (msg.progress) opts.onProgress(msg.progress);
      if (msg.result) return msg.result;
      if (msg.error) throw new ApiError(500, msg.error.code, msg.error.message);
    }
    if (done) throw new ApiError(0, 'network.offline', 'The import stopped before the server answered.');
  }
}

export const templateUrl = (target: ImportTarget) => `/api/${target}/import-template`;
