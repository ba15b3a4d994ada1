import type { Request, Response } from 'express';
import type { ImportResult } from '../../shared/schemas/catalogue';
import type { ImportProgress } from './csv-import';
import { AppError } from './errors';

// An import's progress for the page: a client that sends `Accept: application/x-ndjson` gets a 200 whose body is
// one JSON object a line: `{"progress":{"phase","done","total"}}` as the rows are checked and written, then
// `{"result":{…}}` (the same ImportResult as the JSON answer) or `{"error":{"code","message"}}` when it failed after
// the answer began (nothing written then: the transaction rolled back). Refusals before any work (validation,
// authorisation) are ordinary JSON errors with their status. Any other client gets the JSON answer as before.

export const wantsProgress = (req: Request) => (req.get('accept') ?? '').includes('application/x-ndjson');

export async function streamImport(
  req: Request,
  res: Response,
  run: (onProgress: (p: ImportProgress) => void) => Promise<ImportResult>,
) {
  res.status(200).type('application/x-ndjson').setHeader('Cache-Control', 'no-store');
  res.flushHeaders();
  const line = (o: unknown) => `${JSON.stringify(o)}\n`;
  try {
    const result = await run((progress) => res.write(line({ progress })));
    res.end(line({ result }));
  } catch (err) {
    if (err instanceof AppError) res.end(line({ error: { code: err.code, message: err.message } }));
    else {
      (req as Request & { log?: { error: (o: unknown, m: string) => void } }).log?.error(
        { err },
        'import failed',
      );
      res.end(
        line({
          error: {
            code: 'internal',
            message: 'Something went wrong on our side. It has been logged.',
            requestId: String((req as Request & { id?: unknown }).id),
          },
        }),
      );
    }
  }
}
