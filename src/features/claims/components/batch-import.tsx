import { useMutation, useQueryClient } from '@tanstack/react-query';
import { Download, FileSpreadsheet } from 'lucide-react';
import { useRef, useState } from 'react';
import { Link } from 'react-router';
import type { ClaimBatchResult } from '../../../../shared/schemas/claims';
import { Button, buttonClasses } from '../../../components/ui/button';
import { Card, CardHeader } from '../../../components/ui/card';
import { PageHeader } from '../../../components/ui/page-header';
import { Table, Td, Th } from '../../../components/ui/table';
import { newIdempotencyKey } from '../../../lib/api-client';
import { fileClaim, importClaimBatch } from '../api/claim-mutations';
import { claimQueries } from '../api/claim-queries';
import { CalendarDate } from '../../../components/ui/date-time';

const VERDICT = {
  covered: 'Likely covered',
  review: 'Needs a reviewer',
  excluded: 'Likely excluded',
} as const;

/** A spreadsheet of failed units: preview every row, make drafts of the good ones, file them together. */
export function BatchImport() {
  const qc = useQueryClient();
  const [file, setFile] = useState<{ name: string; text: string } | null>(null);
  const [result, setResult] = useState<ClaimBatchResult | null>(null);
  const [progress, setProgress] = useState<{
    done: number;
    total: number;
    failed: { id: string; message: string }[];
  } | null>(null);
  const run = useMutation({
    mutationFn: (dryRun: boolean) => importClaimBatch(file!.text, file!.name, dryRun),
    onSuccess: (r) => setResult(r),
  });
  // A key per claim, kept for a second "file all" after failures: the ones already filed replay.
  const fileKeys = useRef(new Map<string, string>());
  const fileOne = useMutation({
    mutationFn: ({ id, key }: { id: string; key: string }) => fileClaim(id, key),
  });
  const fileAll = async () => {
    const ids = (result?.rows ?? []).map((r) => r.claimId).filter((x): x is string => !!x);
    const failed: { id: string; message: string }[] = [];
    setProgress({ done: 0, total: ids.length, failed });
    for (const [i, id] of ids.entries()) {
      try {
        let key = fileKeys.current.get(id);
        if (!key) fileKeys.current.set(id, (key = newIdempotencyKey('file')));
        await fileOne.mutateAsync({ id, key });
      } catch (err) {
        failed.push({ id, message: (err as Error).message });
      }
      setProgress({ done: i + 1, total: ids.length, failed: [...failed] });
    }
    await qc.invalidateQueries({ queryKey: claimQueries.all });
  };

  return (
    <>
      <PageHeader
        title="File claims from a spreadsheet"
        description="One row per failed unit, for any of your installations, with its readings."
        actions={
          <a href="/api/claims/batches/template.csv" className={buttonClasses('secondary', 'md')}>
            <Download className="size-4" aria-hidden /> Template
          </a>
        }
      />
      <Card>
        <CardHeader
          title="1. The file"
          description="CSV with a header row; readings may use a decimal comma and a unit (350 mA)."
        />
        <div className="flex flex-wrap items-end gap-3 p-4 sm:p-5">
          <label className={buttonClasses('secondary', 'md', 'cursor-pointer')}>
            <FileSpreadsheet className="size-4" aria-hidden /> {file ? file.name : 'Choose a CSV file'}
            <input
              type="file"
              accept=".csv,text/csv"
              className="sr-only"
              onChange={async (e) => {
                const f = e.target.files?.[0];
                if (!f) return;
                setFile({ name: f.name, text: await f.text() });
                setResult(null);
                setProgress(null);
              }}
            />
          </label>
          <Button
            disabled={!file}
            loading={run.isPending && run.variables === true}
            onClick={() => run.mutate(true)}
          >
            Check the rows
          </Button>
        </div>
        {run.error ? (
          <p role="alert" className="px-5 pb-4 text-sm text-bad-700">
            {run.error.message}
          </p>
        ) : null}
      </Card>
      {result ? (
        <Card className="mt-5">
          <CardHeader
            title={result.dryRun ? '2. Preview' : '2. Drafts made'}
            description={`${result.total} rows: ${result.valid} good, ${result.invalid} with problems${result.dryRun ? '' : `; ${result.created} drafts made`}.`}
            actions={
              result.dryRun ? (
                <Button
                  disabled={!result.valid}
                  loading={run.isPending && run.variables === false}
                  onClick={() => run.mutate(false)}
                >
                  Make {result.valid} drafts
                </Button>
              ) : (
                <Button
                  disabled={!result.created || (progress !== null && progress.done < progress.total)}
                  onClick={() => void fileAll()}
                >
                  File all {result.created}
                </Button>
              )
            }
          />
          {progress ? (
            <div className="space-y-1 border-b border-ink-100 p-4">
              <progress
                className="h-2 w-full accent-brand-700"
                max={progress.total}
                value={progress.done}
                aria-label="Filing the batch"
              />
              <p className="text-sm" role="status">
                Filed {progress.done - progress.failed.length} of {progress.total}
                {progress.failed.length ? `; ${progress.failed.length} refused (open them to see why)` : ''}.
              </p>
            </div>
          ) : null}
          {result.errors.length ? (
            <Table caption="Rows with problems">
              <thead>
                <tr>
                  <Th>Row</Th>
                  <Th>Column</Th>
                  <Th>Problem</Th>
                </tr>
              </thead>
              <tbody className="divide-y divide-ink-100">
                {result.errors.map((e, i) => (
                  <tr key={i}>
                    <Td className="tabular-nums">{e.row}</Td>
                    <Td className="font-mono text-xs">{e.column}</Td>
                    <Td>{e.message}</Td>
                  </tr>
                ))}
              </tbody>
            </Table>
          ) : null}
          <Table caption="Good rows">
            <thead>
              <tr>
                <Th>Row</Th>
                <Th>Site and model</Th>
                <Th>Serials</Th>
                <Th>Failed</Th>
                <Th>Engine</Th>
              </tr>
            </thead>
            <tbody className="divide-y divide-ink-100">
              {result.rows.map((r) => (
                <tr key={r.row}>
                  <Td className="tabular-nums">{r.row}</Td>
                  <Td>
                    {r.claimId ? (
                      <Link className="text-brand-800 underline" to={`/claims/${r.claimId}`}>
                        {r.siteName}
                      </Link>
                    ) : (
                      r.siteName
                    )}{' '}
                    · {r.modelNumber}
                  </Td>
                  <Td className="font-mono text-xs">{r.serials.join(', ')}</Td>
                  <Td>{r.failedOn ? <CalendarDate value={r.failedOn} /> : null}</Td>
                  <Td>{r.verdict ? VERDICT[r.verdict] : '—'}</Td>
                </tr>
              ))}
            </tbody>
          </Table>
        </Card>
      ) : null}
    </>
  );
}
