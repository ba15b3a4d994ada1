// Input checks for every public function of shared/analytics: each validates what it is given against a zod
// schema before computing, so a NaN term, a null life-data entry or a negative count is refused by name
// (AnalyticsInputError, with the field's path) instead of coming back as "0.00", "NaN.NaN" or a TypeError.
// fitWeibull answers the same error as its { ok: false } result; the others throw it. The server's error
// handler turns it into a 400 naming each field.

import { z } from 'zod';

export const ANALYTICS_INPUT_ERROR = 'analytics.invalid_input';

export interface AnalyticsIssue {
  /** Dotted path of the field, from the function's first argument: "cohorts.0.termMonths". */
  path: string;
  message: string;
}

export class AnalyticsInputError extends Error {
  readonly code = ANALYTICS_INPUT_ERROR;
  constructor(
    /** The function refused, e.g. "forecastReserve". */
    readonly fn: string,
    readonly issues: AnalyticsIssue[],
  ) {
    super(`${fn}: ${issues.map((i) => (i.path ? `${i.path}: ${i.message}` : i.message)).join('; ')}`);
    this.name = 'AnalyticsInputError';
  }
}

function pathText(path: readonly PropertyKey[]): string {
  return path.map(String).join('.');
}

/**
 * The issues zod found, as paths and messages; an empty list when the value is valid. `name` prefixes every
 * path; for a tuple of arguments, a list of names replaces each argument's index with its name.
 */
export function issuesOf(
  schema: z.ZodType,
  value: unknown,
  name: string | readonly string[] = '',
): AnalyticsIssue[] {
  const parsed = schema.safeParse(value);
  if (parsed.success) return [];
  return parsed.error.issues.map((i) => {
    let path = i.path as PropertyKey[];
    let prefix = typeof name === 'string' ? name : '';
    if (typeof name !== 'string' && typeof path[0] === 'number' && name[path[0]] !== undefined) {
      prefix = name[path[0]];
      path = path.slice(1);
    }
    return { path: [prefix, pathText(path)].filter(Boolean).join('.'), message: i.message };
  });
}

/**
 * Throws AnalyticsInputError unless `value` fits the schema (for several arguments: a z.tuple, the values in a
 * list and their parameter names). Returns nothing: the caller keeps its own (unchanged) arguments.
 */
export function check(
  fn: string,
  schema: z.ZodType,
  value: unknown,
  name: string | readonly string[] = '',
): void {
  const issues = issuesOf(schema, value, name);
  if (issues.length > 0) throw new AnalyticsInputError(fn, issues);
}

// ---- shared pieces ----

export const finite = (what = 'a number') =>
  z.number({ error: `Expected ${what}.` }).refine(Number.isFinite, `Expected ${what}, not NaN or infinite.`);

export const finiteAtLeast = (min: number, what: string) =>
  finite(what).refine((v) => v >= min, `Expected ${what} >= ${min}.`);

export const positiveFinite = (what: string) =>
  finite(what).refine((v) => v > 0, `Expected ${what} above 0.`);

export const weibullParametersSchema = z.object({
  shape: positiveFinite('a shape'),
  scale: positiveFinite('a scale'),
});

/** A life-data time: a bare number (one unit) or { time, count }. Non-negative and finite. */
export const lifeEntrySchema = z.union(
  [
    finiteAtLeast(0, 'a time'),
    z.object({ time: finiteAtLeast(0, 'a time'), count: finiteAtLeast(0, 'a count') }),
  ],
  { error: 'Expected a time >= 0 or { time, count } with both finite and >= 0.' },
);

export const lifeDataSchema = z.object({
  failures: z.array(lifeEntrySchema, { error: 'Expected a list of failure times.' }),
  suspensions: z.array(lifeEntrySchema, { error: 'Expected a list of suspension times.' }).optional(),
});

export const isoDateSchema = z.iso.date({ error: 'Expected a date like 2024-03-31.' });

// ---- fast paths ----
// Large inputs (a million ungrouped times) are first scanned by hand for the plain good case; zod then runs only
// when the scan finds something it does not vouch for, and decides (and names the field). The scan accepts a
// subset of what the schema accepts, so the schema stays the definition of valid input.

const goodNumber = (v: unknown): boolean => typeof v === 'number' && Number.isFinite(v) && v >= 0;

function goodEntries(list: unknown): boolean {
  if (!Array.isArray(list)) return false;
  for (let i = 0; i < list.length; i++) {
    const e = list[i] as unknown;
    if (typeof e === 'number') {
      if (!goodNumber(e)) return false;
    } else if (typeof e === 'object' && e !== null) {
      const g = e as { time?: unknown; count?: unknown };
      if (!goodNumber(g.time) || !goodNumber(g.count)) return false;
    } else return false;
  }
  return true;
}

/** lifeDataSchema's issues, after a fast scan that vouches for the plain good case. */
export function lifeDataIssues(data: unknown, name = 'data'): AnalyticsIssue[] {
  if (typeof data === 'object' && data !== null) {
    const d = data as { failures?: unknown; suspensions?: unknown };
    if (goodEntries(d.failures) && (d.suspensions === undefined || goodEntries(d.suspensions))) return [];
  }
  return issuesOf(lifeDataSchema, data, name);
}

export function checkLifeData(fn: string, data: unknown, name = 'data'): void {
  const issues = lifeDataIssues(data, name);
  if (issues.length > 0) throw new AnalyticsInputError(fn, issues);
}
