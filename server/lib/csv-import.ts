import Papa from 'papaparse';
import type { z } from 'zod';
import type { ImportRequest, ImportResult, ImportRowError } from '../../shared/schemas/catalogue';
import { AppError } from './errors';

// The spreadsheet side of an import: CSV text or JSON rows in, typed values out, and every problem as
// (row, column, reason). Row numbers are the spreadsheet's: the header is row 1, the first data row is row 2.

export type ColumnKind = 'string' | 'number' | 'boolean' | 'list';
export type ColumnSpec = {
  column: string;
  field: string;
  kind: ColumnKind;
  required: boolean;
  example: string;
};

export type RawRow = { row: number; values: Record<string, unknown> };

/** One column as the services declare it: name, kind, required or optional, the template's example, and the field
 * when it is not the column's name in camelCase. */
export type ColumnDef = readonly [
  column: string,
  kind: ColumnKind,
  presence: 'required' | 'optional',
  example: string,
  field?: string,
];

const camelCase = (column: string) => column.replace(/_([a-z0-9])/g, (_, c: string) => c.toUpperCase());

/**
 * The columns of an import, one line each, in the file's order (the template's too): the one way the products,
 * installations and claim-batch imports declare their columns.
 */
export function csvColumns(defs: readonly ColumnDef[]): ColumnSpec[] {
  return defs.map(([column, kind, presence, example, field]) => ({
    column,
    field: field ?? camelCase(column),
    kind,
    required: presence === 'required',
    example,
  }));
}

export const MAX_LISTED_ERRORS = 500;

/** How far an import has got: rows checked, then rows written (each of `total`). */
export type ImportProgress = { phase: 'checking' | 'writing'; done: number; total: number };

/** Turns the request (CSV text or JSON rows) into raw rows keyed by lower-case column name. */
export function parseCsvRows(
  input: ImportRequest,
  specs: ColumnSpec[],
): { rows: RawRow[]; fileErrors: ImportRowError[] } {
  const first = input.firstRowNumber ?? 2;
  let records: Record<string, unknown>[];
  let header: string[];
  const fileErrors: ImportRowError[] = [];
  if (input.csv !== undefined) {
    const parsed = Papa.parse<Record<string, string>>(input.csv.replace(/^\uFEFF/, ''), {
      header: true,
      skipEmptyLines: 'greedy',
      transformHeader: (h) => h.trim().toLowerCase(),
    });
    header = parsed.meta.fields ?? [];
    records = parsed.data;
    for (const e of parsed.errors.slice(0, 20)) {
      if (e.code === 'UndetectableDelimiter') continue;
      fileErrors.push({ row: (e.row ?? 0) + first, column: '(row)', message: e.message });
    }
  } else {
    records = (input.rows ?? []).map((r) =>
      Object.fromEntries(Object.entries(r).map(([k, v]) => [k.trim().toLowerCase(), v])),
    );
    header = [...new Set(records.flatMap((r) => Object.keys(r)))];
  }
  const known = new Set(specs.map((s) => s.column));
  const unknown = header.filter((h) => h && !known.has(h) && !h.startsWith('_'));
  if (unknown.length) {
    fileErrors.push({
      row: 1,
      column: unknown.join(', '),
      message: `Unknown column${unknown.length > 1 ? 's' : ''}: ${unknown.join(', ')}. Download the template for the column names.`,
    });
  }
  if (input.csv !== undefined || records.length) {
    const missing = specs.filter((s) => s.required && !header.includes(s.column)).map((s) => s.column);
    if (missing.length)
      fileErrors.push({
        row: 1,
        column: missing.join(', '),
        message: `Missing column${missing.length > 1 ? 's' : ''}: ${missing.join(', ')}.`,
      });
  }
  return { rows: records.map((values, i) => ({ row: first + i, values })), fileErrors };
}

const TRUE = new Set(['yes', 'y', 'true', '1']);
const FALSE = new Set(['no', 'n', 'false', '0']);

/** Typed values for a row's fields (empty cells left out), with a reason for each cell that is not its type. */
export function coerceRow(raw: RawRow, specs: ColumnSpec[]) {
  const out: Record<string, unknown> = {};
  const errors: ImportRowError[] = [];
  for (const s of specs) {
    const v = raw.values[s.column];
    if (v === undefined || v === null || (typeof v === 'string' && v.trim() === '')) {
      if (s.kind === 'list') out[s.field] = [];
      continue;
    }
    const str = typeof v === 'string' ? v.trim() : v;
    if (s.kind === 'number') {
      const n = typeof str === 'number' ? str : Number(String(str));
      if (typeof str === 'boolean' || !Number.isFinite(n))
        errors.push({ row: raw.row, column: s.column, message: `"${String(str)}" is not a number.` });
      else out[s.field] = n;
    } else if (s.kind === 'boolean') {
      if (typeof str === 'boolean') out[s.field] = str;
      else if (TRUE.has(String(str).toLowerCase())) out[s.field] = true;
      else if (FALSE.has(String(str).toLowerCase())) out[s.field] = false;
      else errors.push({ row: raw.row, column: s.column, message: `"${String(str)}" is not yes or no.` });
    } else if (s.kind === 'list') {
      out[s.field] = String(str)
        .split(/[;,\s]+/)
        .filter(Boolean);
    } else {
      out[s.field] = String(str);
    }
  }
  return { values: out, errors };
}

/** A zod failure as row errors, each field named by its spreadsheet column. */
export function issuesToRowErrors(
  row: number,
  error: z.ZodError,
  specs: ColumnSpec[],
  skip: Set<string>,
): ImportRowError[] {
  const byField = new Map(specs.map((s) => [s.field, s.column]));
  const out: ImportRowError[] = [];
  for (const i of error.issues) {
    const field = String(i.path[0] ?? '');
    const column = byField.get(field) ?? (field || '(row)');
    if (skip.has(column)) continue; // already reported as not a number / not yes-no
    out.push({ row, column, message: i.message });
  }
  return out;
}

export function templateCsv(specs: ColumnSpec[]) {
  return (
    Papa.unparse(
      { fields: specs.map((s) => s.column), data: [specs.map((s) => s.example)] },
      { newline: '\r\n' },
    ) + '\r\n'
  );
}

export function tooManyRows(n: number, max: number) {
  if (n > max)
    throw new AppError(
      413,
      'import.too_many_rows',
      `The file has ${n} rows; import at most ${max.toLocaleString('en-US')} at once.`,
    );
}

/** Whether the file itself is wrong (unknown or missing columns: row 1), so that no row may be imported. */
export const fileBlocked = (fileErrors: readonly ImportRowError[]) => fileErrors.some((e) => e.row === 1);

/**
 * An import's answer: its counts, and its problems in row order, the first MAX_LISTED_ERRORS of them. `errors`
 * holds every problem, the file's own included; `valid` counts the rows that passed every check.
 */
export function importResult(o: {
  dryRun: boolean;
  total: number;
  valid: number;
  imported: number;
  errors: ImportRowError[];
  fileErrors: readonly ImportRowError[];
}): ImportResult {
  const errors = [...o.errors].sort((a, b) => a.row - b.row);
  return {
    dryRun: o.dryRun,
    total: o.total,
    valid: fileBlocked(o.fileErrors) ? 0 : o.valid,
    invalid: new Set(errors.filter((e) => e.row > 1).map((e) => e.row)).size,
    imported: o.imported,
    errors: errors.slice(0, MAX_LISTED_ERRORS),
    errorsTruncated: errors.length > MAX_LISTED_ERRORS,
  };
}
