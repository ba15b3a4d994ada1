// Where the claims come from: counts of claims (and claimed units) by failure mode, by a condition of the
// installation, by lot and by contractor, a failure mode x condition table, and the claims-ageing table
// (install month x months in service). Plain aggregation over rows the caller has already loaded.

import { z } from 'zod';

import { isoMonth, isoYear, wholeMonthsBetween } from '../engine/dates';
import { check, finite, finiteAtLeast, isoDateSchema } from './validation';

const optionalKey = z.string().nullable().optional();
const claimRowsSchema = z.array(
  z.object({
    failureMode: z.string({ error: 'Expected a failure mode.' }),
    installedOn: z.string(),
    failedOn: z.string(),
    units: finiteAtLeast(0, 'a number of units').optional(),
    claims: finiteAtLeast(0, 'a number of claims').optional(),
    lot: optionalKey,
    contractor: optionalKey,
    location: optionalKey,
    enclosure: optionalKey,
    dimmer: optionalKey,
    supply: optionalKey,
    ambientBand: optionalKey,
  }),
  { error: 'Expected a list of claim rows.' },
);
const datedClaimRowsSchema = z.array(
  z.object({
    installedOn: isoDateSchema,
    failedOn: isoDateSchema,
    claims: finiteAtLeast(0, 'a number of claims').optional(),
  }),
);
const keyFunction = z.custom<(row: ClaimRow) => unknown>(
  (f) => typeof f === 'function',
  'Expected a function.',
);

/** One claim, flattened with the conditions of the installation it came from. */
export interface ClaimRow {
  failureMode: string;
  /** YYYY-MM-DD. */
  installedOn: string;
  failedOn: string;
  /** Units the claim names; 1 by default. For a grouped row, the units of all its claims. */
  units?: number;
  /** How many claims this row stands for (grouped counts from SQL); 1 by default. */
  claims?: number;
  lot?: string | null;
  contractor?: string | null;
  location?: string | null;
  enclosure?: string | null;
  dimmer?: string | null;
  supply?: string | null;
  /** An ambient band such as ambientBand() gives. */
  ambientBand?: string | null;
}

export const ENVIRONMENT_FACTORS = ['location', 'enclosure', 'dimmer', 'supply', 'ambientBand'] as const;
export type EnvironmentFactor = (typeof ENVIRONMENT_FACTORS)[number];

/** The key of rows that do not record the field. */
export const NOT_RECORDED = 'not recorded';

export interface RankedCount {
  key: string;
  claims: number;
  units: number;
  /** This key's claims as a fraction of all the rows' claims. */
  share: number;
}

function compareKeys(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}

function claimCount(rows: readonly ClaimRow[]): number {
  let total = 0;
  for (const row of rows) total += row.claims ?? 1;
  return total;
}

function keyOrNotRecorded(value: string | null | undefined): string {
  return value === null || value === undefined || value === '' ? NOT_RECORDED : value;
}

/** Counts by any key, most claims first (then most units, then the key in code-point order). */
export function rankBy(
  rows: readonly ClaimRow[],
  keyOf: (row: ClaimRow) => string | null | undefined,
): RankedCount[] {
  check('rankBy', claimRowsSchema, rows, 'rows');
  check('rankBy', keyFunction, keyOf, 'keyOf');
  const counts = new Map<string, { claims: number; units: number }>();
  for (const row of rows) {
    const key = keyOrNotRecorded(keyOf(row));
    const entry = counts.get(key) ?? { claims: 0, units: 0 };
    const claims = row.claims ?? 1;
    entry.claims += claims;
    entry.units += row.units ?? claims;
    counts.set(key, entry);
  }
  const total = claimCount(rows);
  return [...counts.entries()]
    .map(([key, { claims, units }]) => ({ key, claims, units, share: total === 0 ? 0 : claims / total }))
    .sort((a, b) => b.claims - a.claims || b.units - a.units || compareKeys(a.key, b.key));
}

export function rankFailureModes(rows: readonly ClaimRow[]): RankedCount[] {
  return rankBy(rows, (row) => row.failureMode);
}

const factorSchema = z.enum(ENVIRONMENT_FACTORS);

export function rankByEnvironment(rows: readonly ClaimRow[], factor: EnvironmentFactor): RankedCount[] {
  check('rankByEnvironment', factorSchema, factor, 'factor');
  return rankBy(rows, (row) => row[factor]);
}

export function rankByLot(rows: readonly ClaimRow[]): RankedCount[] {
  return rankBy(rows, (row) => row.lot);
}

export function rankByContractor(rows: readonly ClaimRow[]): RankedCount[] {
  return rankBy(rows, (row) => row.contractor);
}

export interface CrossTable {
  /** Row and column keys, each ordered by its total claims (most first). */
  rows: string[];
  columns: string[];
  /** counts[i][j]: claims with rows[i] and columns[j]. */
  counts: number[][];
  rowTotals: number[];
  columnTotals: number[];
  total: number;
}

/** Claims counted by two keys at once, e.g. failure mode x enclosure. */
export function crossTabulate(
  rows: readonly ClaimRow[],
  rowKeyOf: (row: ClaimRow) => string | null | undefined,
  columnKeyOf: (row: ClaimRow) => string | null | undefined,
): CrossTable {
  check('crossTabulate', claimRowsSchema, rows, 'rows');
  check(
    'crossTabulate',
    z.tuple([keyFunction, keyFunction]),
    [rowKeyOf, columnKeyOf],
    ['rowKeyOf', 'columnKeyOf'],
  );
  const rowKeys = rankBy(rows, rowKeyOf).map((r) => r.key);
  const columnKeys = rankBy(rows, columnKeyOf).map((r) => r.key);
  const rowIndex = new Map(rowKeys.map((key, i) => [key, i]));
  const columnIndex = new Map(columnKeys.map((key, j) => [key, j]));
  const counts = rowKeys.map(() => new Array<number>(columnKeys.length).fill(0));
  for (const row of rows) {
    counts[rowIndex.get(keyOrNotRecorded(rowKeyOf(row)))!][
      columnIndex.get(keyOrNotRecorded(columnKeyOf(row)))!
    ] += row.claims ?? 1;
  }
  return {
    rows: rowKeys,
    columns: columnKeys,
    counts,
    rowTotals: counts.map((line) => line.reduce((sum, n) => sum + n, 0)),
    columnTotals: columnKeys.map((_, j) => counts.reduce((sum, line) => sum + line[j], 0)),
    total: claimCount(rows),
  };
}

export function failureModesByEnvironment(rows: readonly ClaimRow[], factor: EnvironmentFactor): CrossTable {
  check('failureModesByEnvironment', factorSchema, factor, 'factor');
  return crossTabulate(
    rows,
    (row) => row.failureMode,
    (row) => row[factor],
  );
}

/**
 * An ambient temperature's band, for grouping: "below 25 °C", "25-35 °C", ..., "45 °C and above" with the
 * default edges. A temperature on an edge belongs to the band above it; null when none was recorded.
 */
const ambientBandArgs = z.tuple([
  z.number({ error: 'Expected a temperature in °C, or null.' }).nullable().optional(),
  z
    .array(finite('a band edge in °C'))
    .refine((e) => e.every((v, i) => i === 0 || v > e[i - 1]), 'Band edges must rise.'),
]);

/** A temperature that is null, undefined or not finite (a blank reading) is "not recorded": null. */
export function ambientBand(
  celsius: number | null | undefined,
  edges: readonly number[] = [25, 35, 45],
): string | null {
  check('ambientBand', ambientBandArgs, [celsius, edges], ['celsius', 'edges']);
  if (celsius === null || celsius === undefined || !Number.isFinite(celsius)) return null;
  if (edges.length === 0) return 'all';
  if (celsius < edges[0]) return `below ${edges[0]} °C`;
  for (let i = 1; i < edges.length; i++) if (celsius < edges[i]) return `${edges[i - 1]}-${edges[i]} °C`;
  return `${edges[edges.length - 1]} °C and above`;
}

export interface AgeingTable {
  /** YYYY-MM, from the earliest to the latest install month present (months without claims included). */
  installMonths: string[];
  /** 0 .. the oldest claim's months in service. */
  monthsInService: number[];
  /** counts[i][m]: claims from units installed in installMonths[i] that failed m whole months in service. */
  counts: number[][];
  rowTotals: number[];
  columnTotals: number[];
}

function monthIndex(iso: string): number {
  return isoYear(iso) * 12 + (isoMonth(iso) - 1);
}

function monthLabel(index: number): string {
  const year = Math.floor(index / 12);
  const month = index - year * 12 + 1;
  return `${String(year).padStart(4, '0')}-${month < 10 ? '0' : ''}${month}`;
}

/** One cell of the ageing table already counted (by SQL): install month YYYY-MM, whole months in service. */
export interface AgeingCount {
  installMonth: string;
  monthsInService: number;
  claims: number;
}

/** Claims by install month and whole months in service at failure (the engine's ageMonths). */
export function ageingTable(rows: readonly ClaimRow[]): AgeingTable {
  check('ageingTable', datedClaimRowsSchema, rows, 'rows');
  return ageingTableFromCounts(
    rows.map((row) => ({
      installMonth: row.installedOn.slice(0, 7),
      monthsInService: wholeMonthsBetween(row.installedOn, row.failedOn),
      claims: row.claims ?? 1,
    })),
  );
}

/** The ageing table from counted cells: the same table ageingTable gives from the claims themselves. */
const ageingCountsSchema = z.array(
  z.object({
    installMonth: z.string().regex(/^\d{4}-(0[1-9]|1[0-2])$/, 'Expected a month like 2024-03.'),
    monthsInService: finite('whole months in service').refine(Number.isInteger, 'Expected whole months.'),
    claims: finiteAtLeast(0, 'a number of claims'),
  }),
);

export function ageingTableFromCounts(cells: readonly AgeingCount[]): AgeingTable {
  check('ageingTableFromCounts', ageingCountsSchema, cells, 'cells');
  if (cells.length === 0) {
    return { installMonths: [], monthsInService: [], counts: [], rowTotals: [], columnTotals: [] };
  }
  let first = Infinity;
  let last = -Infinity;
  let oldest = 0;
  const indexed = cells.map((cell) => {
    const install = monthIndex(`${cell.installMonth}-01`);
    const age = cell.monthsInService < 0 ? 0 : cell.monthsInService;
    if (install < first) first = install;
    if (install > last) last = install;
    if (age > oldest) oldest = age;
    return { install, age, claims: cell.claims };
  });
  const counts = Array.from({ length: last - first + 1 }, () => new Array<number>(oldest + 1).fill(0));
  for (const { install, age, claims } of indexed) counts[install - first][age] += claims;
  return {
    installMonths: counts.map((_, i) => monthLabel(first + i)),
    monthsInService: Array.from({ length: oldest + 1 }, (_, m) => m),
    counts,
    rowTotals: counts.map((line) => line.reduce((sum, n) => sum + n, 0)),
    columnTotals: Array.from({ length: oldest + 1 }, (_, m) =>
      counts.reduce((sum, line) => sum + line[m], 0),
    ),
  };
}
