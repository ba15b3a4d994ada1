import { useMutation, useQueryClient } from '@tanstack/react-query';
import Papa from 'papaparse';
import { useRef, useState } from 'react';
import { Download, FileUp } from 'lucide-react';
import type { ImportResult, ImportRowError } from '../../../../shared/schemas/catalogue';
import { plural } from '../../../../shared/engine/finding';
import { Button, buttonClasses } from '../../../components/ui/button';
import { Dialog } from '../../../components/ui/dialog';
import { Table, Td, Th } from '../../../components/ui/table';
import { useToast } from '../../../components/ui/toast';
import { ApiError } from '../../../lib/api-client';
import { importRows, importRowsWithProgress, templateUrl, type ImportTarget } from '../api/import-rows';

const CHUNK = 1000;
type Stage =
  | { kind: 'pick' }
  | { kind: 'working'; label: string; done: number; total: number }
  | { kind: 'preview'; rows: Record<string, string>[]; result: ImportResult }
  | { kind: 'done'; result: ImportResult }
  | { kind: 'failed'; message: string };

const WHAT: Record<ImportTarget, string> = { products: 'product models', installations: 'installations' };

/**
 * Spreadsheet import: read the CSV in the browser, check it on the server in chunks (a dry run: nothing is
 * written) with a progress bar, show each bad row, then import the valid rows in one transaction. Cancelling
 * before the import writes nothing.
 */
export function ImportDialog({
  target,
  open,
  onClose,
}: {
  target: ImportTarget;
  open: boolean;
  onClose: () => void;
}) {
  const [stage, setStage] = useState<Stage>({ kind: 'pick' });
  const abort = useRef<AbortController | null>(null);
  const qc = useQueryClient();
  const { notify } = useToast();

  const close = () => {
    abort.current?.abort();
    abort.current = null;
    setStage({ kind: 'pick' });
    onClose();
  };

  const fail = (e: unknown) => {
    if ((e as Error).name === 'AbortError') return;
    setStage({ kind: 'failed', message: e instanceof ApiError ? e.message : 'Could not read the file.' });
  };

  async function check(file: File) {
    const ctl = new AbortController();
    abort.current = ctl;
    setStage({ kind: 'working', label: 'Reading the file', done: 0, total: file.size });
    const rows = await new Promise<Record<string, string>[]>((resolve, reject) => {
      const out: Record<string, string>[] = [];
      Papa.parse<Record<string, string>>(file, {
        header: true,
        skipEmptyLines: 'greedy',
        chunkSize: 256 * 1024,
        chunk: (res) => {
          out.push(...res.data);
          setStage({ kind: 'working', label: 'Reading the file', done: res.meta.cursor, total: file.size });
        },
        complete: () => resolve(out),
        error: reject,
      });
    });
    if (ctl.signal.aborted) return;
    const merged: ImportResult = {
      dryRun: true,
      total: 0,
      valid: 0,
      invalid: 0,
      imported: 0,
      errors: [],
      errorsTruncated: false,
    };
    for (let i = 0; i < Math.max(rows.length, 1); i += CHUNK) {
      setStage({ kind: 'working', label: 'Checking the rows', done: i, total: rows.length });
      const part = await importRows(target, rows.slice(i, i + CHUNK), {
        dryRun: true,
        firstRowNumber: i + 2,
        signal: ctl.signal,
      });
      merged.total += part.total;
      merged.valid += part.valid;
      merged.invalid += part.invalid;
      const rowOne = (e: ImportRowError) =>
        e.row === 1 && merged.errors.some((x) => x.row === 1 && x.message === e.message);
      merged.errors.push(...part.errors.filter((e) => !rowOne(e)));
      merged.errorsTruncated ||= part.errorsTruncated;
    }
    setStage({ kind: 'preview', rows, result: merged });
  }

  const importing = useMutation({
    mutationFn: ({
      rows,
      signal,
      label,
    }: {
      rows: Record<string, string>[];
      signal: AbortSignal;
      label: string;
    }) =>
      // The server checks the rows again, then writes them: each half of the bar (installations report both).
      importRowsWithProgress(target, rows, {
        signal,
        onProgress: (p) =>
          setStage({
            kind: 'working',
            label: p.phase === 'checking' ? `${label}: checking` : `${label}: writing`,
            done: (p.phase === 'checking' ? 0 : p.total) + p.done,
            total: 2 * p.total,
          }),
      }),
    onSuccess: async (result) => {
      setStage({ kind: 'done', result });
      notify(`${result.imported.toLocaleString()} ${WHAT[target]} imported.`);
      await qc.invalidateQueries({ queryKey: [target] });
    },
    onError: (e) => fail(e),
  });

  function commit(rows: Record<string, string>[]) {
    const ctl = new AbortController();
    abort.current = ctl;
    const label = `Importing ${rows.length.toLocaleString()} rows`;
    setStage({ kind: 'working', label, done: 0, total: 0 });
    importing.mutate({ rows, signal: ctl.signal, label });
  }

  const busy = stage.kind === 'working';
  const pct = busy && stage.total ? Math.round((stage.done / stage.total) * 100) : null;

  return (
    <Dialog
      open={open}
      onClose={close}
      title={`Import ${WHAT[target]}`}
      description="From a CSV file with the template's columns. Nothing is saved until you choose Import."
      footer={
        <>
          <Button variant="secondary" onClick={close}>
            {stage.kind === 'done' ? 'Close' : 'Cancel'}
          </Button>
          {stage.kind === 'preview' ? (
            <Button disabled={stage.result.valid === 0} onClick={() => commit(stage.rows)}>
              Import {stage.result.valid.toLocaleString()} valid {stage.result.valid === 1 ? 'row' : 'rows'}
            </Button>
          ) : null}
        </>
      }
    >
      <div className="space-y-4">
        {stage.kind === 'pick' || stage.kind === 'failed' ? (
          <>
            <a
              href={templateUrl(target)}
              download
              className={buttonClasses('secondary', 'md', 'w-full sm:w-auto')}
            >
              <Download className="size-4" aria-hidden /> Download the template
            </a>
            <label className="block">
              <span className="mb-1.5 block text-sm font-medium text-ink-800">CSV file</span>
              <span className="flex min-h-11 items-center gap-2 rounded-lg border border-dashed border-ink-300 px-3 py-2 text-sm text-ink-700">
                <FileUp className="size-4 shrink-0" aria-hidden />
                <input
                  type="file"
                  accept=".csv,text/csv"
                  className="w-full text-sm"
                  onChange={(e) => {
                    const f = e.target.files?.[0];
                    if (f) check(f).catch(fail);
                  }}
                />
              </span>
            </label>
            {stage.kind === 'failed' ? (
              <p role="alert" className="rounded-lg bg-bad-50 px-3 py-2 text-sm text-bad-800">
                {stage.message}
              </p>
            ) : null}
          </>
        ) : null}
        {busy ? (
          <div>
            <p className="mb-1.5 text-sm text-ink-700">{stage.label}…</p>
            {pct !== null ? (
              <div
                role="progressbar"
                aria-label={stage.label}
                aria-valuemin={0}
                aria-valuemax={100}
                aria-valuenow={pct}
                className="h-3 overflow-hidden rounded-full bg-ink-100"
              >
                <div className="h-full bg-brand-600 transition-[width]" style={{ width: `${pct}%` }} />
              </div>
            ) : (
              <div
                role="progressbar"
                aria-label={stage.label}
                className="h-3 animate-pulse rounded-full bg-brand-200"
              />
            )}
          </div>
        ) : null}
        {stage.kind === 'preview' || stage.kind === 'done' ? <ImportSummary result={stage.result} /> : null}
      </div>
    </Dialog>
  );
}

const rows = (n: number) => `${n.toLocaleString()} ${plural(n, 'row', 'rows')}`;

/** What a check or an import came to, in words, with the rows it left out. */
export function ImportSummary({ result }: { result: ImportResult }) {
  return (
    <>
      <p className="text-sm text-ink-800" role="status">
        {result.dryRun
          ? `${rows(result.total)} read: ${result.valid.toLocaleString()} can be imported, ${result.invalid.toLocaleString()} ${plural(result.invalid, 'has', 'have')} problems and will be left out.`
          : `${rows(result.imported)} imported${result.invalid ? `; ${result.invalid.toLocaleString()} left out` : ''}.`}
      </p>
      {result.errors.length ? (
        <div className="max-h-72 overflow-y-auto rounded-lg border border-ink-200">
          <Table caption="Rows with problems">
            <thead>
              <tr>
                <Th>Row</Th>
                <Th>Column</Th>
                <Th>Reason</Th>
              </tr>
            </thead>
            <tbody className="divide-y divide-ink-100">
              {result.errors.map((e, i) => (
                <tr key={`${e.row}-${e.column}-${i}`}>
                  <Td className="tabular-nums">{e.row}</Td>
                  <Td className="font-mono text-xs">{e.column}</Td>
                  <Td>{e.message}</Td>
                </tr>
              ))}
            </tbody>
          </Table>
        </div>
      ) : null}
      {result.errorsTruncated ? (
        <p className="text-xs text-ink-600">Only the first problems are listed; fix those and check again.</p>
      ) : null}
    </>
  );
}
